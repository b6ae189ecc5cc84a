import { Body, Controller, Get, Param, ParseIntPipe, Patch, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiCreatedResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { ROLES } from '../users/user.entity';
import { CreateProductDto, ProductDto, UpdateProductDto } from './dto/product.dto';
import { ProductsService } from './products.service';

@ApiTags('products')
@ApiBearerAuth()
@Controller('products')
export class ProductsController {
  constructor(private readonly products: ProductsService) {}

  @Get()
  @Roles(...ROLES)
  @ApiOperation({ summary: 'All products (part numbers)' })
  @ApiOkResponse({ type: [ProductDto] })
  list(): Promise<ProductDto[]> {
    return this.products.list();
  }

  @Get(':id')
  @Roles(...ROLES)
  @ApiOkResponse({ type: ProductDto })
  get(@Param('id', ParseIntPipe) id: number): Promise<ProductDto> {
    return this.products.get(id);
  }

  @Post()
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Add a product' })
  @ApiCreatedResponse({ type: ProductDto })
  create(@Body() dto: CreateProductDto, @CurrentUser() actor: AuthUser): Promise<ProductDto> {
    return this.products.create(dto, actor);
  }

  @Patch(':id')
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Change a product (serial pattern only while it has no units)' })
  @ApiOkResponse({ type: ProductDto })
  update(@Param('id', ParseIntPipe) id: number, @Body() dto: UpdateProductDto, @CurrentUser() actor: AuthUser): Promise<ProductDto> {
    return this.products.update(id, dto, actor);
  }
}

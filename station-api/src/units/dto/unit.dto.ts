import { ApiProperty } from '@nestjs/swagger';
import { LotState } from '../../lots/lot.entity';
import { ProductDto } from '../../products/dto/product.dto';
import { UnitState } from '../unit.entity';

export class UnitLotDto {
  @ApiProperty() id!: number;
  @ApiProperty() code!: string;
  @ApiProperty({ enum: LotState }) state!: LotState;
}

export class UnitDto {
  @ApiProperty() id!: number;
  @ApiProperty({ example: 'K5A-2649-00017' }) serial!: string;
  @ApiProperty({ enum: UnitState }) state!: UnitState;
  @ApiProperty({ description: 'completed runs (pass or fail)' }) testCount!: number;
  @ApiProperty({ type: String, nullable: true, description: 'ISO 8601' }) lastTestedAt!: string | null;
  @ApiProperty({ type: String, nullable: true, description: 'when the operator sent the failed unit to repair (ISO 8601); null: not sent' })
  sentToRepairAt!: string | null;
  @ApiProperty({ type: UnitLotDto }) lot!: UnitLotDto;
  @ApiProperty({ type: ProductDto }) product!: ProductDto;
}

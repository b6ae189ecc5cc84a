import { ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsIn, IsOptional } from 'class-validator';
import { PRINTER_DPI, type PrinterDpi } from '../repair-tag.pdf';

export class RepairTagQueryDto {
  @ApiPropertyOptional({
    enum: PRINTER_DPI,
    default: 203,
    description: "the label printer's resolution: the barcode's bars are laid out in whole dots of it",
  })
  @IsOptional()
  @Type(() => Number)
  @IsIn([...PRINTER_DPI], { message: `dpi must be ${PRINTER_DPI.join(' or ')} (the label printer's resolution)` })
  dpi?: PrinterDpi;
}

import { ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsIn } from 'class-validator';
import { Optional } from '../../common/validation/presence';
import { PRINTER_DPI, type PrinterDpi } from '../repair-tag.pdf';

export class RepairTagQueryDto {
  @ApiPropertyOptional({
    enum: PRINTER_DPI,
    default: 203,
    description: "the label printer's resolution: the barcode's bars are laid out in whole dots of it",
  })
  @Optional()
  @Type(() => Number)
  @IsIn([...PRINTER_DPI], { message: `dpi must be ${PRINTER_DPI.join(' or ')} (the label printer's resolution)` })
  dpi?: PrinterDpi;
}

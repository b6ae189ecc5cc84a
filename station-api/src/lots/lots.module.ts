import { Module } from '@nestjs/common';
import { ProductsModule } from '../products/products.module';
import { YieldFiguresService } from '../yield/yield-figures.service';
import { LotCertificateService } from './lot-certificate.service';
import { LotImportService } from './lot-import.service';
import { LotReleaseService } from './lot-release.service';
import { LotsController } from './lots.controller';
import { LotsService } from './lots.service';

@Module({
  imports: [ProductsModule],
  controllers: [LotsController],
  // the yield figures of the certificate come from the yield module's own service (its module exports nothing)
  providers: [LotsService, LotImportService, LotReleaseService, LotCertificateService, YieldFiguresService],
  exports: [LotsService],
})
export class LotsModule {}

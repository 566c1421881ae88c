import { Module } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { PublicationsModule } from '../publications/publications.module';
import { ReviewsStore, TypeormReviewsStore, AuditStore, TypeormAuditStore } from '@psiform/server';
import { AuditService } from './audit.service';
import { AuditController } from './audit.controller';
import { SubjectAuditController } from './subject-audit.controller';

@Module({
  imports: [PublicationsModule],
  controllers: [AuditController, SubjectAuditController],
  providers: [
    { provide: AuditStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormAuditStore(ds) },
    { provide: ReviewsStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormReviewsStore(ds) },
    AuditService,
  ],
})
export class AuditModule {}

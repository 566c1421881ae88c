import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { AUDIT_ENTITIES, AuditStore, TypeormAuditStore } from '@psiform/server';
import { PublicationsModule } from '../publications/publications.module';
import { ReviewsModule } from '../reviews/reviews.module';
import { AuditService } from './audit.service';
import { AuditController } from './audit.controller';
import { SubjectAuditController } from './subject-audit.controller';

@Module({
  imports: [TypeOrmModule.forFeature(AUDIT_ENTITIES), PublicationsModule, ReviewsModule],
  controllers: [AuditController, SubjectAuditController],
  providers: [{ provide: AuditStore, useClass: TypeormAuditStore }, AuditService],
})
export class AuditModule {}

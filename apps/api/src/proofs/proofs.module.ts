import { Module } from '@nestjs/common';
import { FiguresModule } from '../figures/figures.module';
import { JobsModule } from '../jobs/jobs.module';
import { AssetsModule } from '../assets/assets.module';
import { ProofsController } from './proofs.controller';
import { ProofsService } from './proofs.service';

@Module({
  imports: [FiguresModule, JobsModule, AssetsModule],
  controllers: [ProofsController],
  providers: [ProofsService],
})
export class ProofsModule {}

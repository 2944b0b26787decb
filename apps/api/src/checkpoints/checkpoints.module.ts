import { Global, Module } from '@nestjs/common';
import { CheckpointsController } from './checkpoints.controller';
import { CheckpointsService } from './checkpoints.service';

/** Signed checkpoints of the products' chains (Ed25519, key outside the database). */
@Global()
@Module({ controllers: [CheckpointsController], providers: [CheckpointsService], exports: [CheckpointsService] })
export class CheckpointsModule {}

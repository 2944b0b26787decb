import { Global, Module } from '@nestjs/common';
import { AssessmentService } from './assessment.service';
import { EvaluationsController } from './evaluations.controller';

@Global()
@Module({ controllers: [EvaluationsController], providers: [AssessmentService], exports: [AssessmentService] })
export class EvaluationsModule {}

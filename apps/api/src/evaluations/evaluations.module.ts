import { Global, Module } from '@nestjs/common';
import { AssessmentService } from './assessment.service';
import { EvaluationsController } from './evaluations.controller';
import { EvaluationPool } from './evaluation-pool';

@Global()
@Module({ controllers: [EvaluationsController], providers: [AssessmentService, EvaluationPool], exports: [AssessmentService] })
export class EvaluationsModule {}

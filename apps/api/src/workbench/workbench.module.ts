import { Module } from '@nestjs/common';
import { MyWorkService } from './my-work.service';
import { WorkbenchController } from './workbench.controller';

/** The API reads the design workbench needs beyond the record routes: the caller, and the caller's revisions. */
@Module({ controllers: [WorkbenchController], providers: [MyWorkService] })
export class WorkbenchModule {}

import { Body, Controller, HttpCode, Post } from '@nestjs/common';
import { UserLimit } from '../infra/http/user-limits';
import { SizingService } from './sizing.service';

@Controller('api/v1/sizing')
export class SizingController {
  constructor(private readonly sizing: SizingService) {}

  /** Stateless: searches the standard sizes for screws that pass the stated requirements; nothing is stored. */
  @Post()
  @HttpCode(200)
  @UserLimit('searches')
  size(@Body() body: unknown) {
    return this.sizing.size(body);
  }
}

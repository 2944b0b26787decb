import { Controller, Get, Query } from '@nestjs/common';
import { FRICTION_LIBRARY, NUT_MATERIALS, SCREW_MATERIALS, THREAD_FORMS, THREAD_SIZES, threadGeometry } from '@leadline/mechanics';

/** Reference data a design can name instead of typing values: standard sizes, friction sources, materials. */
@Controller('api/v1')
export class LibraryController {
  private readonly sizes = THREAD_SIZES.map((s) => {
    const g = threadGeometry({ form: s.form, majorDiameter: s.majorDiameter, pitch: s.pitch, starts: 1, loadFlankAngle: null });
    return { ...s, meanDiameter: g.meanDiameter, minorDiameter: g.minorDiameter, threadHeight: g.threadHeight };
  });

  /** Standard thread sizes (SI metres), optionally filtered by form. */
  @Get('thread-sizes')
  threadSizes(@Query('form') form?: string) {
    const items = form ? this.sizes.filter((s) => s.form === form) : this.sizes;
    return { forms: THREAD_FORMS, items };
  }

  /** Friction coefficient ranges for thread and collar pairs, each with its published source. */
  @Get('friction-sources')
  frictionSources(@Query('surface') surface?: string) {
    return { items: surface ? FRICTION_LIBRARY.filter((e) => e.surface === surface) : FRICTION_LIBRARY };
  }

  /** Screw and nut materials with the source of each value. */
  @Get('materials')
  materials() {
    return { screws: SCREW_MATERIALS, nuts: NUT_MATERIALS };
  }
}

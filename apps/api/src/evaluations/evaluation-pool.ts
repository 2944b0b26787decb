/**
 * Worker threads for the evaluation route. Assessing a design (validation, engine, rules with their messages, the
 * answer's text) is CPU work of tens of microseconds; done in the request's thread it holds up every other request of
 * the instance. The route hands it to LEADLINE_EVALUATION_THREADS worker threads (Piscina) and only sends the text
 * they return; 0 threads assess in the request's thread. Both paths run the same functions (evaluation.worker.ts).
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { Inject, Injectable, type OnModuleDestroy } from '@nestjs/common';
import type { RuleSet } from '@leadline/rules';
import { Piscina } from 'piscina';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { ValidationProblem } from '../infra/http/problem';
import { answerEvaluation, type EvaluationOutcome, type EvaluationTask } from './evaluation.worker';

const WORKER = 'evaluation.worker.js';

/**
 * Tasks handed to a thread before it has answered the last: with one at a time the thread waits for the request's
 * thread to take each answer before it gets the next, and the two take turns instead of working side by side
 * (measured: 0.8 of the route's floor with 1, above it with 16; docs/performance.md).
 */
const TASKS_AHEAD_PER_THREAD = 16;

/**
 * The worker's file: beside this module in the built service; from the TypeScript sources (the test suite) the built
 * file of the same tree, which README's test command builds before it runs.
 */
export function evaluationWorkerFile(): string {
  const beside = join(__dirname, WORKER);
  if (existsSync(beside)) return beside;
  const built = join(__dirname, '../../../../dist/apps/api/src/evaluations', WORKER);
  if (existsSync(built)) return built;
  throw new Error(`the evaluation worker ${WORKER} is not built: run npm run build (LEADLINE_EVALUATION_THREADS=0 assesses in the request instead)`);
}

@Injectable()
export class EvaluationPool implements OnModuleDestroy {
  private pool: Piscina<EvaluationTask, EvaluationOutcome> | null = null;
  /** A key per rule set object: a thread is sent a rule set once, then its key. */
  private readonly keys = new WeakMap<RuleSet, string>();
  private keyed = 0;
  readonly threads: number;

  constructor(@Inject(APP_CONFIG) config: AppConfig) {
    this.threads = config.LEADLINE_EVALUATION_THREADS;
  }

  /** The route's answer as JSON (UTF-8 bytes); a design the contract refuses is a 422 naming its fields. */
  async answer(body: unknown, ruleSet: RuleSet, trace: boolean): Promise<Buffer> {
    const ruleSetKey = this.keyOf(ruleSet);
    let outcome: EvaluationOutcome;
    if (this.threads === 0) {
      outcome = answerEvaluation({ body, ruleSetKey, ruleSet, trace });
    } else {
      const pool = this.started();
      outcome = await pool.run({ body, ruleSetKey, trace });
      if (!ArrayBuffer.isView(outcome) && 'ruleSetWanted' in outcome) outcome = await pool.run({ body, ruleSetKey, ruleSet, trace });
    }
    if (ArrayBuffer.isView(outcome)) return Buffer.from(outcome.buffer, outcome.byteOffset, outcome.byteLength);
    if ('problems' in outcome) throw new ValidationProblem(outcome.problems);
    throw new Error(`an evaluation thread asked twice for rule set ${outcome.ruleSetWanted}`);
  }

  async onModuleDestroy(): Promise<void> {
    const pool = this.pool;
    this.pool = null;
    await pool?.destroy();
  }

  /** The threads, started on the first evaluation (an instance that never evaluates starts none). */
  private started(): Piscina<EvaluationTask, EvaluationOutcome> {
    this.pool ??= new Piscina<EvaluationTask, EvaluationOutcome>({
      filename: evaluationWorkerFile(),
      name: 'answerEvaluation',
      minThreads: this.threads,
      maxThreads: this.threads,
      idleTimeout: Number.POSITIVE_INFINITY,
      concurrentTasksPerWorker: TASKS_AHEAD_PER_THREAD,
    });
    return this.pool;
  }

  private keyOf(ruleSet: RuleSet): string {
    let key = this.keys.get(ruleSet);
    if (key === undefined) {
      key = `${ruleSet.version}#${++this.keyed}`;
      this.keys.set(ruleSet, key);
    }
    return key;
  }
}

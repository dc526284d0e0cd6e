import { Controller, HttpCode, Module, OnModuleInit, Post } from '@nestjs/common';
import { ApiExcludeController } from '@nestjs/swagger';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { Public } from '../common/auth/auth.decorators';
import { AppConfig } from '../config/app-config';

/**
 * The signing benchmark's baseline over HTTP: the cheapest write the app can serve (BEGIN, one INSERT, COMMIT)
 * through the same Nest pipeline, pool and transaction helper as signing. Public on purpose: a stricter baseline
 * than signing, which also checks the session.
 */
@ApiExcludeController()
@Controller('bench')
class BareInsertController {
  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  @Post('bare-insert')
  @Public()
  @HttpCode(200)
  async bareInsert(): Promise<{ ok: true }> {
    await this.dataSource.transaction((manager) =>
      manager.query(`INSERT INTO bench_scratch (note) VALUES ('bare insert')`),
    );
    return { ok: true };
  }
}

/**
 * Only the benchmark's own app module (bench-app.ts) imports this, and only with BENCH_ROUTES=true, which the
 * configuration refuses in production; the api's AppModule never serves it.
 */
@Module({ controllers: [BareInsertController] })
export class BenchRoutesModule implements OnModuleInit {
  constructor(
    private readonly config: AppConfig,
    @InjectDataSource() private readonly dataSource: DataSource,
  ) {
    if (!config.benchRoutes) throw new Error('BenchRoutesModule needs BENCH_ROUTES=true (benchmarks only)');
  }

  async onModuleInit(): Promise<void> {
    await this.dataSource.query(
      `CREATE TABLE IF NOT EXISTS bench_scratch (id bigserial PRIMARY KEY, note text NOT NULL, at timestamptz NOT NULL DEFAULT now())`,
    );
  }
}

import type { DataSource } from 'typeorm';
import type { HealthResponse } from '@loopwright/contract';

const API_VERSION = '0.1.0';
/** A health probe must answer even when MariaDB hangs rather than refuses: give up after this. */
const PROBE_TIMEOUT_MS = 1_500;

export async function checkHealth(dataSource: DataSource): Promise<HealthResponse> {
  const started = performance.now();
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      dataSource.query('SELECT 1'),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new Error('database probe timed out')), PROBE_TIMEOUT_MS);
      }),
    ]);
    return { status: 'ok', database: 'up', databaseLatencyMs: Math.round((performance.now() - started) * 10) / 10, version: API_VERSION };
  } catch {
    return { status: 'degraded', database: 'down', databaseLatencyMs: null, version: API_VERSION };
  } finally {
    clearTimeout(timer);
  }
}

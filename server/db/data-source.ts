import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { entities } from './entities';
import { migrations } from './migrations';
import { SnakeNamingStrategy } from './naming-strategy';

export interface DataSourceOptions {
  url: string;
  poolSize?: number;
  applicationName?: string;
}

/** The one DataSource shape: the server, the worker, the migration command and the tests. */
export function createDataSource({ url, poolSize = 10, applicationName = 'platterpost' }: DataSourceOptions): DataSource {
  return new DataSource({
    type: 'postgres',
    url,
    entities,
    migrations,
    migrationsTableName: 'schema_migrations',
    migrationsTransactionMode: 'each',
    namingStrategy: new SnakeNamingStrategy(),
    synchronize: false,
    logging: false,
    extra: { max: poolSize, application_name: applicationName },
  });
}

export async function runMigrations(dataSource: DataSource): Promise<string[]> {
  const ran = await dataSource.runMigrations({ transaction: 'each' });
  return ran.map((m) => m.name);
}

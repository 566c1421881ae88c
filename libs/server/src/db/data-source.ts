import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { loadDatabaseConfig } from '../config/config';
import { dataSourceOptions } from './schema';

/**
 * Compiled data source (dist/db/data-source.js) for the TypeORM CLI, e.g.
 * `npx typeorm migration:show -d apps/api/dist/db/data-source.js`. Reads DATABASE_URL.
 */
const dataSource = new DataSource(dataSourceOptions(loadDatabaseConfig(process.env).url));
export default dataSource;

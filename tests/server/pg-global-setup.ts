/**
 * Project server-pg: the same server tests against a real PostgreSQL. Starts a throwaway cluster
 * (pg/cluster.ts), migrates one `wyeward_template` database through the app's own migration runner,
 * and provides its address; each test file copies the template (`CREATE DATABASE … TEMPLATE`, a file
 * copy: fast). The PGlite template is made too, for tests that move data between the two. The
 * cluster is stopped and its directory removed at the end.
 */
import type { TestProject } from 'vitest/node';
import { closeDb, openDb } from '../../server/db/index.ts';
import { providePgliteTemplate } from './global-setup.ts';
import { adminQuery, startCluster } from './pg/cluster.ts';

export const TEMPLATE_DATABASE = 'wyeward_template';

export default async function setup(project: TestProject) {
  const cluster = await startCluster();
  const onExit = () => cluster.stop();
  process.once('exit', onExit);
  try {
    await adminQuery(cluster.url, `create database ${TEMPLATE_DATABASE}`);
    const db = await openDb({ url: cluster.urlOf(TEMPLATE_DATABASE), poolMax: 1 });
    await closeDb(db);
    project.provide('pgServer', cluster.url);
    const dropPglite = await providePgliteTemplate(project);
    return () => {
      dropPglite();
      process.off('exit', onExit);
      cluster.stop();
    };
  } catch (err) {
    cluster.stop();
    throw err;
  }
}

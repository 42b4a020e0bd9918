import type { TestProject } from 'vitest/node';
import { buildClient } from '../e2e/helpers/build-client.js';

declare module 'vitest' {
  export interface ProvidedContext {
    e2eClientDir: string;
  }
}

/** Vitest globalSetup for the e2e project: builds the client once for every e2e file. */
export default async function setup(project: TestProject): Promise<() => void> {
  const client = await buildClient();
  project.provide('e2eClientDir', client.dir);
  return () => client.remove();
}

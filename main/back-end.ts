import fs from 'node:fs';
import { speciesReference } from '../app/core/species-reference.js';
import { openDatabase, type OpenOptions, type SyrinxDatabase } from '../db/connection.js';
import { createSpeciesRepository } from '../db/repositories/species-repository.js';
import { databaseFile } from './data-directory.js';
import { createDispatcher, createHandlers, type Dispatcher } from './handlers.js';

export type BackEnd = {
  readonly db: SyrinxDatabase;
  readonly dispatch: Dispatcher;
  readonly databaseFile: string;
  close(): void;
};

export type BackEndOptions = {
  readonly dataDirectory: string;
  readonly appVersion: string;
  readonly host: 'desktop' | 'browser';
  readonly now?: () => Date;
  readonly openOptions?: OpenOptions;
  readonly log?: (message: string) => void;
};

/** Opens the clinic database in a data folder and wires the contract's handler table to it. */
export function startBackEnd(options: BackEndOptions): BackEnd {
  fs.mkdirSync(options.dataDirectory, { recursive: true });
  const file = databaseFile(options.dataDirectory);
  const db = openDatabase(file, options.openOptions);
  const now = options.now ?? (() => new Date());
  createSpeciesRepository(db).seedReference(speciesReference, now());
  const handlers = createHandlers({
    db,
    appVersion: options.appVersion,
    dataDirectory: options.dataDirectory,
    host: options.host,
    now,
  });
  return {
    db,
    dispatch: createDispatcher(handlers, options.log),
    databaseFile: file,
    close: () => {
      if (db.open) db.close();
    },
  };
}

// Runs in a worker thread and owns one search index for its whole life: it loads the saved index
// file or builds a fresh one (reading the published shelf from the database itself), then answers
// searches. The main thread never holds, builds or unpacks an index: it only posts queries and
// gets back one page of results. A rebuild starts a new worker while this one keeps answering;
// the service swaps to the new one when it is ready (see service.ts).
import { mkdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { dirname } from 'node:path';
import { parentPort, workerData } from 'node:worker_threads';
import lunr from 'lunr';
import { Sequelize } from 'sequelize';
import { createHostChooser, useHosts } from '../../db/hosts';
import { initModels } from '../../db/models';
import { AppError } from '../../errors';
import { loadBodies, loadDocuments, publishedFingerprint } from './documents';
import { buildIndex, indexFileContent, SEARCH_FORMAT, type IndexFile, type SearchBody, type SearchDocument } from './index-builder';
import { createSearcher, type Rank, type Searcher } from './searcher';
import { unpackRanks, type SearchWorkerData, type WorkerReply, type WorkerRequest } from './search-protocol';

/** Written to a temporary name, then renamed, so a reader never sees half a file. */
async function writeAtomically(target: string, content: string): Promise<void> {
  await mkdir(dirname(target), { recursive: true });
  const temp = `${target}.${process.pid}.${Date.now()}.${Math.random().toString(36).slice(2)}.tmp`;
  try {
    await writeFile(temp, content);
    await rename(temp, target);
  } catch (err) {
    await rm(temp, { force: true });
    throw err;
  }
}

const { file, db } = workerData as SearchWorkerData;
let sequelize: Sequelize | null = null;
let searcher: Searcher | null = null;
let ranks = new Map<number, Rank>();

function database(): Sequelize {
  if (!db) throw new Error('this search worker has no database');
  if (!sequelize) {
    sequelize = new Sequelize(db.database, db.username, db.password, {
      host: db.host,
      port: db.port,
      dialect: 'mariadb',
      logging: false,
      dialectOptions: { connectTimeout: 3000 },
      timezone: '+00:00',
      pool: { max: 2, min: 0, acquire: 10_000, idle: 5_000 },
      define: { underscored: true },
    });
    if (db.hosts?.length) useHosts(sequelize, createHostChooser(db.hosts));
    initModels(sequelize);
  }
  return sequelize;
}

function install(documents: SearchDocument[], bodies: SearchBody[], index: lunr.Index) {
  for (const doc of documents) doc.rating = ranks.get(doc.id)?.mean ?? null;
  searcher = createSearcher({ index, documents, bodies });
}

function ready(
  source: 'file' | 'build',
  reason: string | null,
  fingerprint: string,
  builtAt: string,
  buildMs: number | null,
  writeError: string | null,
): WorkerReply {
  const docs = searcher!.documents;
  return { type: 'ready', source, reason, fingerprint, builtAt, documents: docs.length, ids: Int32Array.from(docs, (d) => d.id), buildMs, writeError };
}

async function readIndexFile(fingerprint: string | null): Promise<{ file: IndexFile; index: lunr.Index } | string> {
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch {
    return 'is missing';
  }
  let parsed: IndexFile;
  try {
    parsed = JSON.parse(text) as IndexFile;
  } catch {
    return 'is corrupt (not JSON)';
  }
  if (parsed?.format !== SEARCH_FORMAT) return `has format ${String(parsed?.format)}, this version writes ${SEARCH_FORMAT}`;
  if (fingerprint !== null && parsed.fingerprint !== fingerprint) return 'is out of date with the shelf';
  if (!Array.isArray(parsed.documents) || !Array.isArray(parsed.bodies) || typeof parsed.index !== 'object' || !parsed.index)
    return 'is corrupt (missing parts)';
  try {
    return { file: parsed, index: lunr.Index.load(parsed.index) };
  } catch {
    return 'is corrupt (the index does not load)';
  }
}

async function buildAndSave(documents: SearchDocument[], bodies: SearchBody[], fingerprint: string, reason: string | null): Promise<WorkerReply> {
  const started = performance.now();
  const index = buildIndex(documents);
  const buildMs = performance.now() - started;
  let writeError: string | null = null;
  try {
    await writeAtomically(file, indexFileContent(documents, fingerprint, index, bodies));
  } catch (err) {
    writeError = (err as Error).message;
  }
  install(documents, bodies, index);
  return ready('build', reason, fingerprint, new Date().toISOString(), buildMs, writeError);
}

async function handle(message: WorkerRequest): Promise<WorkerReply | null> {
  switch (message.type) {
    case 'start': {
      const fingerprint = db ? await publishedFingerprint(database()) : null;
      const saved = await readIndexFile(fingerprint);
      if (typeof saved === 'object') {
        install(saved.file.documents, saved.file.bodies, saved.index);
        return ready('file', null, saved.file.fingerprint, saved.file.builtAt, null, null);
      }
      if (!db) return { type: 'failed', error: `the index file ${saved}` };
      return buildAndSave(await loadDocuments(), await loadBodies(), fingerprint!, `${file} ${saved}`);
    }
    case 'build': {
      const fingerprint = await publishedFingerprint(database());
      if (fingerprint === message.unless) return { type: 'unchanged' };
      return buildAndSave(await loadDocuments(), await loadBodies(), fingerprint, null);
    }
    case 'build-file': {
      const { documents, bodies } = JSON.parse(await readFile(message.documentsFile, 'utf8')) as { documents: SearchDocument[]; bodies: SearchBody[] };
      return buildAndSave(documents, bodies, message.fingerprint, null);
    }
    case 'ranks':
      ranks = unpackRanks(message.data);
      for (const doc of searcher?.documents ?? []) doc.rating = ranks.get(doc.id)?.mean ?? null;
      return null;
    case 'search':
      try {
        if (!searcher) throw new AppError(503, 'search_starting', 'Search is still starting up. Try again in a few seconds.');
        return { type: 'answer', id: message.id, ok: true, response: searcher.search(message.query, ranks, message.visibility) };
      } catch (err) {
        if (err instanceof AppError)
          return { type: 'answer', id: message.id, ok: false, error: { status: err.status, code: err.code, message: err.message, fields: err.fields } };
        return { type: 'answer', id: message.id, ok: false, error: { status: 500, code: 'search_failed', message: (err as Error).message } };
      }
  }
}

parentPort!.on('message', (message: WorkerRequest) => {
  handle(message)
    .then((reply) => {
      if (!reply) return;
      // the ids go over as a transferred buffer, not a copy
      if (reply.type === 'ready') parentPort!.postMessage(reply, [reply.ids.buffer as ArrayBuffer]);
      else parentPort!.postMessage(reply);
    })
    .catch((err: Error) => parentPort!.postMessage({ type: 'failed', error: err.message } satisfies WorkerReply))
    .finally(() => {
      // a worker that only built (and was not kept) lets go of its connections
      if (message.type !== 'search' && message.type !== 'ranks' && sequelize) {
        const s = sequelize;
        sequelize = null;
        void s.close().catch(() => undefined);
      }
    });
});

/**
 * Sizing worker body: takes the project the build loaded (passed as a structured clone, so the
 * worker neither reads nor validates the records again, nor compiles their schemas), then sizes and
 * draws one design per message and writes its entry into the sized cache (size-cache.ts), replying
 * with the design's counts only.
 *
 * With `pages` (a build without simulation), the worker also writes the design's pages and
 * downloads into the site's staging folder as the site writer's own thread would
 * (src/site/design-pages.ts: from the page cache, or rendered in runs of the template engine) and
 * replies with the rows the writer keeps; a design whose sized entry is already there (`read`) is
 * read from it instead of being sized. The writer's thread then only gathers rows.
 *
 * A worker may be started before the build knows its work (size-pool.ts, `prestartWorkers`: loading
 * the code then overlaps the build's own start-up); it is then handed its work, the same object as
 * `workerData` would be, in a first message `{ init }`.
 *
 * Protocol: in `{ index, read? }` or `"close"`; out `{ ready }` once the project is in, `{ index,
 * variants, feasible, rows? }` per design (after `"close"`, the last pages are written before the
 * worker exits), or `{ index, error }` / `{ index, record }` (a design the site cannot publish) / `{ fatal }`.
 */
import process from "node:process";
import { parentPort, workerData } from "node:worker_threads";
import { RecordError } from "../model/errors.ts";
import { PageWriter, pageSetup, type DesignRows } from "../site/design-pages.ts";
import { CatalogueChecks } from "../site/validate.ts";
import { assembleDesign, catalogueHead, type LoadedProject } from "./pipeline.ts";
import { sizeAndRenderDesign, sizeAndStoreDesign } from "./size-cache.ts";

export type SizeReply =
  | { ready: true }
  | { fatal: string }
  | { index: number; variants: number; feasible: number; rows?: DesignRows }
  | { index: number; error: string }
  | { index: number; record: { file: string; pointer: string; detail: string } };

/** The site writer's settings for a worker that writes pages (see above). */
export interface PagesJob {
  /** The staging folder the site is written into. */
  out: string;
  /** The page cache (`.cache/site`), and whether to read it (`build --rebuild` only writes it). */
  cacheDir: string;
  readCache: boolean;
  pathPrefix: string;
  builtAt: string;
  version: string;
  /** Pages per run of the template engine in one worker. */
  chunkPages: number;
}

/** What the pool hands each worker. */
export interface SizeWorkerData {
  cacheDir: string;
  project: LoadedProject;
  pages?: PagesJob;
}

const port = parentPort;
if (port === null) throw new Error("size-worker-main.ts must run in a worker thread");
const reply = (r: SizeReply): void => port.postMessage(r);

/** Sizes (or reads) one design, writes its pages, and returns its rows. */
async function designPages(
  project: LoadedProject,
  cacheDir: string,
  writer: PageWriter,
  head: ReturnType<typeof catalogueHead>,
  index: number,
  read: boolean,
): Promise<SizeReply> {
  const design = project.designs[index];
  if (design === undefined) throw new Error(`no design #${index}`);
  const stats = { hits: 0, misses: 0, keys: [] as string[] };
  const { rendered } = sizeAndRenderDesign(project, design, cacheDir, stats, { read });
  // As the build's own thread assembles a design without simulation (build.ts).
  const d = { ...assembleDesign(design, rendered, new Map()), builtKey: stats.keys[0]! };
  const variants = d.variants.length;
  const feasible = d.variants.filter((v) => v.sized.feasible).length;
  try {
    // The design's own checks; those across designs run on the writer's thread (CatalogueChecks.known).
    new CatalogueChecks(head).design(d, index);
  } catch (err) {
    if (err instanceof RecordError)
      return { index, record: { file: err.file, pointer: err.pointer, detail: err.detail } };
    throw err;
  }
  return { index, variants, feasible, rows: await writer.design(d) };
}

/** Takes designs one message at a time, as the module comment says. */
function serve({ cacheDir, project, pages }: SizeWorkerData): void {
  if (project?.ok !== true || !Array.isArray(project.designs)) {
    reply({ fatal: "the worker was given no loaded project" });
    return;
  }
  const head = pages ? catalogueHead(project, pages.builtAt, pages.version) : null;
  const writer =
    pages && head
      ? new PageWriter(pageSetup(head, pages.pathPrefix), pages.out, {
          cacheDir: pages.cacheDir,
          readCache: pages.readCache,
          chunkPages: pages.chunkPages,
        })
      : null;
  // One message at a time: the pool sends the next design only after this one's reply.
  let work: Promise<void> = Promise.resolve();
  port!.on("message", (msg: { index: number; read?: boolean } | "close") => {
    work = work.then(async () => {
      if (msg === "close") {
        try {
          await writer?.flush();
          process.exit(0);
        } catch (err) {
          reply({ fatal: err instanceof Error ? (err.stack ?? err.message) : String(err) });
        }
        return;
      }
      try {
        if (writer && head) reply(await designPages(project, cacheDir, writer, head, msg.index, msg.read === true));
        else {
          const design = project.designs[msg.index];
          if (design === undefined) throw new Error(`no design #${msg.index}`);
          reply({ index: msg.index, ...sizeAndStoreDesign(project, design, cacheDir) });
        }
      } catch (err) {
        reply({ index: msg.index, error: err instanceof Error ? (err.stack ?? err.message) : String(err) });
      }
    });
  });
  reply({ ready: true });
}

// Started with its work (workerData), or started early and handed its work as the first message.
const given = workerData as SizeWorkerData | null | undefined;
if (given?.project !== undefined) serve(given);
else port.once("message", (msg: { init: SizeWorkerData }) => serve(msg.init));

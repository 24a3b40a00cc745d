// Entry file of the analysis worker threads (see pool.ts). Plain JavaScript, so that Node starts
// it as it is, under tsx, vitest and `next start` alike (the production build does not contain
// it); it loads the TypeScript tasks through tsx's scoped import, which also resolves `@/` paths.
import { tsImport } from "tsx/esm/api";

const { runTask } = await tsImport("./tasks.ts", import.meta.url);

export default runTask;

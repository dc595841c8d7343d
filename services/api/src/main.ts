import { startApi } from './start.ts';

/** `node --import tsx services/api/src/main.ts`: the API process (configuration: README.md). */
const api = await startApi();
process.stderr.write(`thermargin api listening on ${api.url}\n`);
const stop = () => {
  api.close().then(
    () => process.exit(0),
    () => process.exit(1),
  );
};
process.once('SIGINT', stop);
process.once('SIGTERM', stop);

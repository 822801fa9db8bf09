/**
 * The plots' decimation lives in app/analysis/envelope.ts, pure, so main can
 * cut a big stored run to the slices on screen with the same rule
 * (main/service/run-opener.ts) and the page draws both alike.
 */
export { envelope, lowerBound, type Envelope, type EnvelopeSeries } from '../analysis/envelope.ts';

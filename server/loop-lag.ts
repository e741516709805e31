// Benchmarks only (LOOP_LAG_LOG_S): logs how late the event loop ran, so `npm run bench:load` can
// read the figures from the server's output. Nothing is exposed over HTTP.
import { monitorEventLoopDelay } from 'node:perf_hooks';

export function logLoopLag(everySeconds: number, log: (line: string) => void = (l) => console.log(l)) {
  const histogram = monitorEventLoopDelay({ resolution: 10 });
  histogram.enable();
  const ms = (ns: number) => (ns / 1e6).toFixed(1);
  const timer = setInterval(() => {
    if (histogram.count === 0) return;
    log(
      `rigshelf: loop-lag ${JSON.stringify({ at: Date.now(), p50: +ms(histogram.percentile(50)), p99: +ms(histogram.percentile(99)), max: +ms(histogram.max) })}`,
    );
    histogram.reset();
  }, everySeconds * 1000);
  timer.unref();
  return {
    stop() {
      clearInterval(timer);
      histogram.disable();
    },
  };
}

// npm run bench – warm render + sign of the sample calculation report (about 6 pages).
// Median wall time over 15 runs after 2 warm-up runs; target: under 400 ms on this machine.
// React runs in production mode, as on the server (set NODE_ENV to override).
Object.assign(process.env, { NODE_ENV: process.env.NODE_ENV ?? "production" });

const RUNS = 15;
const WARMUP = 2;
const TARGET_MS = 400;

async function main() {
  const { produceSignedReport } = await import("../lib/reports/produce");
  const { sampleReportModel } = await import("../lib/reports/sample");
  const { createSigningIdentity } = await import("../lib/reports/signing");
  const { layoutReport } = await import("../lib/reports/render");

  const secret = "bench-server-secret-0123456789abcdef";
  const model = sampleReportModel();
  const identity = createSigningIdentity(model.workspace.name, secret);
  const { pages } = await layoutReport({ ...model, signer: { name: model.workspace.name, fingerprint: identity.fingerprint } });

  for (let i = 0; i < WARMUP; i++) await produceSignedReport(model, identity, secret);
  const wall: number[] = [];
  const cpu: number[] = [];
  let bytes = 0;
  for (let i = 0; i < RUNS; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    const out = await produceSignedReport(model, identity, secret);
    wall.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
    bytes = out.pdf.length;
  }
  const median = (xs: number[]) => {
    const s = [...xs].sort((a, b) => a - b);
    return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
  };
  const med = median(wall);
  const sorted = [...wall].sort((a, b) => a - b);
  console.log(`report: render + sign, ${pages.length} pages, ${(bytes / 1024).toFixed(0)} KiB, NODE_ENV=${process.env.NODE_ENV}`);
  console.log(`  wall median ${med.toFixed(0)} ms (min ${sorted[0].toFixed(0)}, max ${sorted[sorted.length - 1].toFixed(0)}) over ${RUNS} runs after ${WARMUP} warm-up`);
  console.log(`  CPU median ${median(cpu).toFixed(0)} ms (includes GC threads)`);
  console.log(`  target < ${TARGET_MS} ms: ${med < TARGET_MS ? "met" : "NOT met"}`);
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});

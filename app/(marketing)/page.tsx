import Link from "next/link";
import { Wordmark } from "@/app/_components/mark";
import { LinkButton } from "@/app/_components/ui";

export default function Home() {
  return (
    <div className="min-h-screen">
      <header className="mx-auto flex max-w-6xl items-center justify-between px-6 py-5">
        <Wordmark />
        <nav className="flex items-center gap-2">
          <Link href="/verify" className="px-3 text-ink-2 hover:text-ink">
            Verify a report
          </Link>
          <LinkButton href="/signin" variant="quiet">
            Sign in
          </LinkButton>
          <LinkButton href="/signup" variant="primary">
            Start a 14-day trial
          </LinkButton>
        </nav>
      </header>
      <main className="mx-auto max-w-6xl px-6 pb-20 pt-10">
        <div className="grid gap-10 md:grid-cols-[1.2fr_1fr]">
          <section>
            <p className="mb-3 text-[12px] uppercase tracking-[0.12em] text-copper">For analog design teams</p>
            <h1 className="text-[38px] leading-[1.1]">
              Op-amp design calculations your checker can follow and your client can verify.
            </h1>
            <p className="mt-5 max-w-xl text-[16px] text-ink-2">
              Gain stages, difference amplifiers, output stages, active filters and voltage references, worked out with the
              real op-amp&apos;s limits: closed-loop bandwidth, slew rate, swing against the rails at the real load, DC error over
              temperature, noise, stability and component tolerance. A second engineer checks it, a lead approves it, and
              the client receives a signed, revision-controlled PDF.
            </p>
            <div className="mt-7 flex gap-3">
              <LinkButton href="/signup" variant="primary">
                Create a workspace
              </LinkButton>
              <LinkButton href="/verify">Check a report you received</LinkButton>
            </div>
          </section>
          <section className="pad rounded-lg border border-rule p-5 text-[13px]">
            <div className="mb-3 flex items-baseline justify-between border-b border-rule pb-2">
              <span className="font-semibold">C-014 · Sensor front-end gain stage</span>
              <span className="text-ink-3">Rev B · approved</span>
            </div>
            <table className="table-dense">
              <tbody>
                {[
                  ["Noise gain", "NG", "11.00", "V/V"],
                  ["Closed-loop −3 dB bandwidth", "f₋₃dB", "90.91", "kHz"],
                  ["Full-power bandwidth at 2 V peak", "fp", "79.58", "kHz"],
                  ["Output noise, 10 Hz to 100 kHz", "en,out", "41.2", "µV rms"],
                ].map(([l, s, v, u]) => (
                  <tr key={l}>
                    <td>{l}</td>
                    <td className="mono text-ink-2">{s}</td>
                    <td className="num mono">{v}</td>
                    <td className="text-ink-2">{u}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <ul className="mt-4 space-y-1.5">
              <li>
                <span className="mr-2 font-semibold text-pass">✓ Pass</span>Output swing within the rails at 2 kΩ.
              </li>
              <li>
                <span className="mr-2 font-semibold text-warn">! Warning</span>Phase margin 48° with 220 pF load.
              </li>
            </ul>
            <p className="mt-4 text-[11.5px] text-ink-3">Illustration with invented values.</p>
          </section>
        </div>
      </main>
    </div>
  );
}

/**
 * The issued report: render the model, sign it with the workspace identity, hash the final bytes.
 */
import { createHash } from "node:crypto";
import type { ReportModel } from "./model";
import { renderReportPdf } from "./render";
import { signPdf, type SigningIdentity } from "./signing";

/** The signed report and the SHA-256 of its bytes (lower-case hex), as stored in `reports`. */
export interface SignedReport {
  pdf: Buffer;
  sha256: string;
}

/**
 * Renders, signs and hashes one report.
 *
 * The printed signer (name and certificate fingerprint) is taken from the identity unless the
 * model already carries it; a model naming a different certificate is refused.
 *
 * @param model the report data (validated).
 * @param identity the workspace's signing identity (certificate, encrypted key, fingerprint).
 * @param serverSecret the secret the key is encrypted with.
 * @param options.signingTime time written into the signature (defaults to now).
 * @param options.location signature location (defaults to "Loopwright").
 */
export async function produceSignedReport(
  model: ReportModel,
  identity: SigningIdentity,
  serverSecret: string,
  options: { signingTime?: Date; location?: string } = {},
): Promise<SignedReport> {
  if (model.signer && model.signer.fingerprint !== identity.fingerprint) {
    throw new Error("the report names a different signing certificate than the identity it is signed with");
  }
  const printed: ReportModel = model.signer ? model : { ...model, signer: { name: model.workspace.name, fingerprint: identity.fingerprint } };
  const unsigned = await renderReportPdf(printed);
  const c = model.calculation;
  const pdf = await signPdf(unsigned, identity, serverSecret, {
    reason: `Issued calculation report ${c.number} rev. ${c.revision} (${model.verification.code})`,
    name: model.workspace.name,
    location: options.location ?? "Loopwright",
    signingTime: options.signingTime,
  });
  return { pdf, sha256: createHash("sha256").update(pdf).digest("hex") };
}

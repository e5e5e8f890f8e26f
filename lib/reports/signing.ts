/**
 * The workspace signing identity and the PDF signature of issued reports.
 *
 * Each workspace has its own RSA 2048 key pair and a self-issued X.509 certificate naming the
 * firm. The private key is stored encrypted at rest (AES-256-GCM under a key derived from the
 * server secret with HKDF-SHA256 and a random salt); it is decrypted only for the moment of
 * signing. Signatures are PKCS#7 detached (adbe.pkcs7.detached, SHA-256) in an incremental update
 * added by @signpdf, so they cover every byte of the rendered report except the signature itself.
 *
 * Pure functions over strings and buffers: no database, no files, no environment.
 */
import { createCipheriv, createDecipheriv, createHash, generateKeyPairSync, hkdfSync, randomBytes } from "node:crypto";
import forge from "node-forge";
import { plainAddPlaceholder } from "@signpdf/placeholder-plain";
import { P12Signer } from "@signpdf/signer-p12";
import { SignPdf } from "@signpdf/signpdf";

/** What is stored per workspace (db/schema.ts `signingIdentities`). */
export interface SigningIdentity {
  /** Self-issued X.509 certificate, PEM. */
  certificatePem: string;
  /** Encrypted PKCS#8 private key PEM; see {@link encryptSigningKey} for the layout. */
  encryptedKey: string;
  /** SHA-256 of the certificate's DER bytes, lower-case hex (64 characters). */
  fingerprint: string;
}

/** What the signature dictionary says about the signing (shown by PDF readers and pdfsig). */
export interface SignatureMeta {
  /** Why it was signed, e.g. "Issued calculation report C-014 rev. B". */
  reason: string;
  /** Signer name, usually the workspace (firm) name. */
  name: string;
  /** Where, e.g. the firm's town, or "Loopwright". */
  location: string;
  contactInfo?: string;
  /** Signing time written into the signature; defaults to now. */
  signingTime?: Date;
}

const KEY_FORMAT_VERSION = 1;
const SALT_BYTES = 16;
const IV_BYTES = 12;
const TAG_BYTES = 16;
const HKDF_INFO = "loopwright signing key at rest v1";
const AAD = Buffer.from("loopwright/signing-key/v1", "utf8");
const CERT_YEARS = 10;
/** Room for the PKCS#7 blob (one 2048-bit certificate and signature need about 1.7 kB). */
const SIGNATURE_LENGTH = 8192;

function assertSecret(serverSecret: string): void {
  if (typeof serverSecret !== "string" || serverSecret.length < 16) {
    throw new Error("server secret must be a string of at least 16 characters");
  }
}

function deriveKey(serverSecret: string, salt: Buffer): Buffer {
  return Buffer.from(hkdfSync("sha256", Buffer.from(serverSecret, "utf8"), salt, HKDF_INFO, 32));
}

/**
 * Encrypts a PKCS#8 private key PEM for storage.
 *
 * Layout of the returned base64 string: version (1 byte, = 1) | salt (16) | iv (12) |
 * GCM tag (16) | ciphertext. The AES-256 key is HKDF-SHA256(serverSecret, salt).
 *
 * @param keyPem PKCS#8 private key, PEM.
 * @param serverSecret the server's secret (at least 16 characters).
 * @returns base64 string holding everything needed to decrypt with the same secret.
 */
export function encryptSigningKey(keyPem: string, serverSecret: string): string {
  assertSecret(serverSecret);
  const salt = randomBytes(SALT_BYTES);
  const iv = randomBytes(IV_BYTES);
  const cipher = createCipheriv("aes-256-gcm", deriveKey(serverSecret, salt), iv);
  cipher.setAAD(AAD);
  const ciphertext = Buffer.concat([cipher.update(keyPem, "utf8"), cipher.final()]);
  const tag = cipher.getAuthTag();
  return Buffer.concat([Buffer.from([KEY_FORMAT_VERSION]), salt, iv, tag, ciphertext]).toString("base64");
}

/**
 * Decrypts a stored signing key.
 *
 * @param encryptedKey the base64 string made by {@link encryptSigningKey}.
 * @param serverSecret the secret it was encrypted with.
 * @returns the PKCS#8 private key PEM.
 * @throws Error when the secret is wrong or the data was altered (GCM authentication fails).
 */
export function decryptSigningKey(encryptedKey: string, serverSecret: string): string {
  assertSecret(serverSecret);
  const raw = Buffer.from(encryptedKey, "base64");
  const head = 1 + SALT_BYTES + IV_BYTES + TAG_BYTES;
  if (raw.length <= head || raw[0] !== KEY_FORMAT_VERSION) {
    throw new Error("signing key could not be decrypted: unknown or damaged key format");
  }
  const salt = raw.subarray(1, 1 + SALT_BYTES);
  const iv = raw.subarray(1 + SALT_BYTES, 1 + SALT_BYTES + IV_BYTES);
  const tag = raw.subarray(1 + SALT_BYTES + IV_BYTES, head);
  const ciphertext = raw.subarray(head);
  try {
    const decipher = createDecipheriv("aes-256-gcm", deriveKey(serverSecret, salt), iv);
    decipher.setAAD(AAD);
    decipher.setAuthTag(tag);
    return Buffer.concat([decipher.update(ciphertext), decipher.final()]).toString("utf8");
  } catch {
    throw new Error("signing key could not be decrypted: wrong server secret or damaged key data");
  }
}

/** SHA-256 of a certificate's DER bytes, lower-case hex. */
export function certificateFingerprint(certificatePem: string): string {
  const der = forge.asn1.toDer(forge.pki.certificateToAsn1(forge.pki.certificateFromPem(certificatePem))).getBytes();
  return createHash("sha256").update(Buffer.from(der, "binary")).digest("hex");
}

/** Fingerprint in the usual printed form: upper-case hex pairs separated by colons. */
export function formatFingerprint(fingerprint: string): string {
  return (fingerprint.toUpperCase().match(/.{2}/g) ?? []).join(":");
}

/**
 * A DirectoryString value forge round-trips unchanged. forge re-encodes a parsed UTF8String a
 * second time when it rebuilds a certificate (as @signpdf does when it embeds it in the
 * signature), which breaks any non-ASCII name; a BMPString (16-bit big-endian code units) is
 * read and written symmetrically. So: ASCII names as UTF8String, others as BMPString.
 * @internal
 */
function directoryString(name: string): { value: string; valueTagClass: number } {
  if (/^[\x20-\x7e]*$/.test(name)) return { value: name, valueTagClass: forge.asn1.Type.UTF8 };
  // forge writes a BMPString's JS string as 16-bit big-endian code units, and reads it back so.
  return { value: name, valueTagClass: forge.asn1.Type.BMPSTRING };
}

/**
 * Plain-ASCII form of a text for the signature dictionary: @signpdf writes its strings as
 * UTF-8 bytes inside a PDF literal string, which readers show garbled for non-ASCII text.
 * @internal
 */
export function asciiForPdfString(text: string): string {
  const special: Record<string, string> = { Ø: "O", ø: "o", ß: "ss", Æ: "AE", æ: "ae", Œ: "OE", œ: "oe", Ł: "L", ł: "l", Đ: "D", đ: "d", Þ: "Th", þ: "th" };
  return text
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .replace(/[^\x20-\x7e]/g, (c) => special[c] ?? "?");
}

/**
 * Creates a workspace's signing identity: an RSA 2048 key pair (Node's native generator) and a
 * self-issued X.509 v3 certificate with CN and O = the workspace name, valid for 10 years from
 * `now`, key usage digitalSignature + nonRepudiation, signed with SHA-256.
 *
 * @param workspaceName the firm's name as it should appear as signer (1–64 characters).
 * @param serverSecret the server's secret (at least 16 characters) that encrypts the key.
 * @param options.now start of the validity period (defaults to the current time).
 */
export function createSigningIdentity(
  workspaceName: string,
  serverSecret: string,
  options: { now?: Date } = {},
): SigningIdentity {
  assertSecret(serverSecret);
  const name = workspaceName.trim();
  if (name.length < 1 || name.length > 64) {
    throw new Error("workspace name must be 1 to 64 characters for the signing certificate");
  }
  const { publicKey, privateKey } = generateKeyPairSync("rsa", {
    modulusLength: 2048,
    publicExponent: 0x10001,
    publicKeyEncoding: { type: "spki", format: "pem" },
    privateKeyEncoding: { type: "pkcs8", format: "pem" },
  });

  const cert = forge.pki.createCertificate();
  cert.publicKey = forge.pki.publicKeyFromPem(publicKey);
  // Positive 128-bit serial: clear the top bit of the first byte.
  const serial = randomBytes(16);
  serial[0] &= 0x7f;
  cert.serialNumber = serial.toString("hex");
  const notBefore = options.now ? new Date(options.now.getTime()) : new Date();
  notBefore.setUTCMilliseconds(0);
  const notAfter = new Date(notBefore.getTime());
  notAfter.setUTCFullYear(notAfter.getUTCFullYear() + CERT_YEARS);
  cert.validity.notBefore = notBefore;
  cert.validity.notAfter = notAfter;
  const attrs = [
    { name: "commonName", ...directoryString(name) },
    { name: "organizationName", ...directoryString(name) },
  ] as forge.pki.CertificateField[];
  cert.setSubject(attrs);
  cert.setIssuer(attrs);
  cert.setExtensions([
    { name: "basicConstraints", cA: false, critical: true },
    { name: "keyUsage", critical: true, digitalSignature: true, nonRepudiation: true },
    { name: "subjectKeyIdentifier" },
  ]);
  cert.sign(forge.pki.privateKeyFromPem(privateKey), forge.md.sha256.create());
  const certificatePem = forge.pki.certificateToPem(cert);

  return {
    certificatePem,
    encryptedKey: encryptSigningKey(privateKey, serverSecret),
    fingerprint: certificateFingerprint(certificatePem),
  };
}

/**
 * Builds the short-lived, in-memory PKCS#12 bundle @signpdf's P12Signer reads.
 * @internal
 */
function buildP12(keyPem: string, certificatePem: string, passphrase: string): Buffer {
  const key = forge.pki.privateKeyFromPem(keyPem);
  const cert = forge.pki.certificateFromPem(certificatePem);
  // The bundle lives only in memory for one signature under a random passphrase, so one
  // key-derivation round is enough (2048 rounds would cost ~25 ms of pure-JS work per report).
  const asn1 = forge.pkcs12.toPkcs12Asn1(key, [cert], passphrase, { algorithm: "3des", count: 1 });
  return Buffer.from(forge.asn1.toDer(asn1).getBytes(), "binary");
}

/**
 * Signs a PDF with the workspace identity: adds a signature placeholder (incremental update,
 * invisible widget on page 1) and fills it with a PKCS#7 detached SHA-256 signature.
 *
 * @param pdf the rendered report.
 * @param identity the workspace's certificate and encrypted key.
 * @param serverSecret the secret the key was encrypted with.
 * @param meta reason, signer name, location and contact written into the signature dictionary.
 * @returns the signed PDF (the input bytes, then the signature update).
 */
export async function signPdf(
  pdf: Buffer,
  identity: Pick<SigningIdentity, "certificatePem" | "encryptedKey">,
  serverSecret: string,
  meta: SignatureMeta,
): Promise<Buffer> {
  const keyPem = decryptSigningKey(identity.encryptedKey, serverSecret);
  const passphrase = randomBytes(12).toString("hex");
  const p12 = buildP12(keyPem, identity.certificatePem, passphrase);
  const signingTime = meta.signingTime ?? new Date();
  const withPlaceholder = plainAddPlaceholder({
    pdfBuffer: pdf,
    reason: asciiForPdfString(meta.reason),
    name: asciiForPdfString(meta.name),
    location: asciiForPdfString(meta.location),
    contactInfo: asciiForPdfString(meta.contactInfo ?? ""),
    signingTime,
    signatureLength: SIGNATURE_LENGTH,
    appName: "Loopwright",
  });
  // A P12Signer keeps state from its first use: make a new one for every signature.
  const signer = new P12Signer(p12, { passphrase });
  return new SignPdf().sign(withPlaceholder, signer, signingTime);
}

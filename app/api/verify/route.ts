import { z } from "zod";
import { publicRoute } from "@/lib/auth/guard";
import { parseQuery } from "@/lib/http";
import { readUpload } from "@/lib/attachments/multipart";
import { clientIp, limitVerify, MAX_VERIFY_BYTES, verifyCode, verifyFile } from "@/lib/reports/verify";

const query = z.object({ code: z.string({ error: "code is required, e.g. LW-7K3Q-9XPA" }).trim().min(1, "code is required, e.g. LW-7K3Q-9XPA").max(64, "code is too long") });

// GET /api/verify?code=LW-… – public: the issued report a verification code names (rate limited per IP)
export const GET = publicRoute(async ({ req }) => {
  const { code } = parseQuery(req, query);
  await limitVerify(clientIp(req.headers));
  return { result: await verifyCode(code) };
});

// POST /api/verify – public: upload a PDF (multipart field "file"); whether it is byte for byte an issued report (rate limited, size limited)
export const POST = publicRoute(async ({ req }) => {
  await limitVerify(clientIp(req.headers));
  const { file } = await readUpload(req, { maxBytes: MAX_VERIFY_BYTES, what: "A report to verify" });
  return { result: await verifyFile(file.bytes) };
});

import { redirect } from "next/navigation";
import { requirePageUser } from "@/lib/auth/page";
import { listWorkspacesForUser } from "@/db/queries/workspaces";

// /w – the first workspace of the signed-in user, or the form to create one.
export default async function WorkspacesIndex() {
  const user = await requirePageUser("/w");
  const rows = await listWorkspacesForUser(user.id);
  if (!rows.length) redirect("/w/new");
  redirect(`/w/${rows[0].workspace.slug}/projects`);
}

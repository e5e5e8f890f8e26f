"use client";

import Link from "next/link";
import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { Button, Field, Notice, Panel, Select, Tag, TextInput } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";

type Role = "owner" | "engineer" | "checker" | "client";
const ROLES: Array<{ value: Role; label: string; note: string }> = [
  { value: "engineer", label: "Engineer", note: "prepares calculations, manages parts" },
  { value: "checker", label: "Checker", note: "also checks, returns and approves" },
  { value: "owner", label: "Owner", note: "everything, billing and members" },
  { value: "client", label: "Client", note: "free; sees shared projects' issued reports" },
];

interface Member {
  membershipId: string;
  userId: string;
  name: string;
  email: string;
  role: Role;
  joinedAt: number;
}
interface Invitation {
  id: string;
  email: string;
  role: Role;
  projectIds: string[];
  invitedBy: string;
  createdAt: number;
  expiresAt: number;
}
interface Seats {
  used: number;
  pending: number;
  limit: number;
}

export function MembersView({
  slug,
  selfUserId,
  initial,
  projects,
}: {
  slug: string;
  selfUserId: string;
  initial: { members: Member[]; invitations: Invitation[]; seats: Seats };
  projects: Array<{ id: string; name: string }>;
}) {
  const qc = useQueryClient();
  const members = useQuery({ queryKey: ["members", slug], queryFn: () => api<{ members: Member[]; seats: Seats }>(`/api/w/${slug}/members`), initialData: { members: initial.members, seats: initial.seats } });
  const invitations = useQuery({
    queryKey: ["invitations", slug],
    queryFn: () => api<{ invitations: Invitation[] }>(`/api/w/${slug}/invitations`).then((r) => r.invitations),
    initialData: initial.invitations,
  });
  const refresh = () => {
    qc.invalidateQueries({ queryKey: ["members", slug] });
    qc.invalidateQueries({ queryKey: ["invitations", slug] });
  };
  const [rowError, setRowError] = useState<string>();
  const changeRole = useMutation({
    mutationFn: ({ id, role }: { id: string; role: Role }) => api(`/api/w/${slug}/members/${id}`, { method: "PATCH", body: { role } }),
    onSuccess: () => (setRowError(undefined), refresh()),
    onError: (e) => (setRowError((e as Error).message), refresh()),
  });
  const remove = useMutation({
    mutationFn: (id: string) => api(`/api/w/${slug}/members/${id}`, { method: "DELETE" }),
    onSuccess: () => (setRowError(undefined), refresh()),
    onError: (e) => setRowError((e as Error).message),
  });
  const revoke = useMutation({ mutationFn: (id: string) => api(`/api/w/${slug}/invitations/${id}`, { method: "DELETE" }), onSuccess: refresh });
  const seats = members.data.seats;
  const projectName = (id: string) => projects.find((p) => p.id === id)?.name ?? "(removed)";

  return (
    <div className="grid gap-6 xl:grid-cols-[1fr_360px]">
      <div className="space-y-6">
        <div>
          <div className="mb-2 flex items-baseline justify-between">
            <h2 className="text-[15px]">Members</h2>
            <p className="text-[13px] text-ink-2" data-testid="seat-usage">
              Seats: <span className="mono">{seats.used}</span> used{seats.pending ? <>, <span className="mono">{seats.pending}</span> invited</> : null} of{" "}
              <span className="mono">{seats.limit}</span>
              <Link href={`/w/${slug}/billing#seats`} className="ml-2 font-medium text-copper underline-offset-2 hover:underline">
                Add seats
              </Link>
            </p>
          </div>
          {rowError ? (
            <div className="mb-2">
              <Notice tone="error">{rowError}</Notice>
            </div>
          ) : null}
          <div className="overflow-x-auto rounded-lg border border-rule bg-sheet">
            <table className="table-dense" aria-label="Members">
              <thead>
                <tr>
                  <th>Name</th>
                  <th>E-mail</th>
                  <th>Role</th>
                  <th className="num">Joined</th>
                  <th />
                </tr>
              </thead>
              <tbody>
                {members.data.members.map((m) => (
                  <tr key={m.membershipId}>
                    <td className="font-medium">
                      {m.name}
                      {m.userId === selfUserId ? <span className="ml-1.5 text-ink-3">(you)</span> : null}
                    </td>
                    <td className="text-ink-2">{m.email}</td>
                    <td>
                      <select
                        aria-label={`Role of ${m.name}`}
                        className="h-7 rounded border border-rule-strong bg-white/70 px-1.5 text-[13px]"
                        value={m.role}
                        onChange={(e) => changeRole.mutate({ id: m.membershipId, role: e.target.value as Role })}
                      >
                        {ROLES.map((r) => (
                          <option key={r.value} value={r.value}>
                            {r.label}
                          </option>
                        ))}
                      </select>
                    </td>
                    <td className="num mono text-ink-2">{new Date(m.joinedAt).toISOString().slice(0, 10)}</td>
                    <td className="text-right">
                      <Button size="sm" variant="quiet" onClick={() => confirm(`Remove ${m.name} from the workspace?`) && remove.mutate(m.membershipId)}>
                        Remove
                      </Button>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </div>
        <div>
          <h2 className="mb-2 text-[15px]">Pending invitations</h2>
          {invitations.data.length === 0 ? (
            <p className="text-ink-3">None.</p>
          ) : (
            <div className="overflow-x-auto rounded-lg border border-rule bg-sheet">
              <table className="table-dense" aria-label="Pending invitations">
                <thead>
                  <tr>
                    <th>E-mail</th>
                    <th>Role</th>
                    <th>Projects</th>
                    <th>Invited by</th>
                    <th className="num">Expires</th>
                    <th />
                  </tr>
                </thead>
                <tbody>
                  {invitations.data.map((i) => (
                    <tr key={i.id}>
                      <td>{i.email}</td>
                      <td>
                        <Tag>{i.role}</Tag>
                      </td>
                      <td className="text-ink-2">{i.projectIds.length ? i.projectIds.map(projectName).join(", ") : "—"}</td>
                      <td className="text-ink-2">{i.invitedBy}</td>
                      <td className="num mono text-ink-2">{new Date(i.expiresAt).toISOString().slice(0, 10)}</td>
                      <td className="text-right">
                        <Button size="sm" variant="quiet" onClick={() => revoke.mutate(i.id)}>
                          Revoke
                        </Button>
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </div>
      </div>
      <InviteForm slug={slug} projects={projects} onInvited={refresh} />
    </div>
  );
}

function InviteForm({ slug, projects, onInvited }: { slug: string; projects: Array<{ id: string; name: string }>; onInvited: () => void }) {
  const [email, setEmail] = useState("");
  const [role, setRole] = useState<Role>("engineer");
  const [projectIds, setProjectIds] = useState<string[]>([]);
  const [result, setResult] = useState<{ link: string; mailSent: boolean; email: string }>();
  const m = useMutation({
    mutationFn: () => api<{ link: string; mailSent: boolean }>(`/api/w/${slug}/invitations`, { body: { email, role, projectIds: role === "client" ? projectIds : [] } }),
    onSuccess: (r) => {
      setResult({ ...r, email });
      setEmail("");
      setProjectIds([]);
      onInvited();
    },
  });
  const err = m.error instanceof ApiError ? m.error : undefined;
  return (
    <Panel title="Invite someone">
      <form
        className="space-y-3"
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          setResult(undefined);
          m.mutate();
        }}
      >
        {err ? <Notice tone="error">{err.message}</Notice> : null}
        {result ? (
          <Notice tone="success">
            {result.mailSent ? `Invitation e-mailed to ${result.email}.` : `The e-mail to ${result.email} could not be sent; pass them this link yourself.`}
            <span className="mt-1 block break-all text-[12px] text-ink-2">
              Link (shown once): <span className="mono">{result.link}</span>
            </span>
          </Notice>
        ) : null}
        <Field label="E-mail" htmlFor="inv-email" error={err?.fields.email}>
          <TextInput id="inv-email" type="email" value={email} onChange={(e) => setEmail(e.target.value)} aria-invalid={!!err?.fields.email} />
        </Field>
        <Field label="Role" htmlFor="inv-role" error={err?.fields.role} hint={ROLES.find((r) => r.value === role)?.note}>
          <Select id="inv-role" value={role} onChange={(e) => setRole(e.target.value as Role)}>
            {ROLES.map((r) => (
              <option key={r.value} value={r.value}>
                {r.label}
              </option>
            ))}
          </Select>
        </Field>
        {role === "client" ? (
          <fieldset className="space-y-1">
            <legend className="mb-1 text-[13px] font-medium text-ink-2">Projects the client will see</legend>
            {projects.length === 0 ? <p className="text-ink-3">Create a project first.</p> : null}
            {projects.map((p) => (
              <label key={p.id} className="flex items-center gap-2 text-[13.5px]">
                <input
                  type="checkbox"
                  className="accent-copper"
                  checked={projectIds.includes(p.id)}
                  onChange={(e) => setProjectIds(e.target.checked ? [...projectIds, p.id] : projectIds.filter((x) => x !== p.id))}
                />
                {p.name}
              </label>
            ))}
            {err?.fields.projectIds ? <p className="text-[12.5px] text-fail">{err.fields.projectIds}</p> : null}
          </fieldset>
        ) : null}
        <Button type="submit" variant="primary" disabled={m.isPending}>
          Send invitation
        </Button>
      </form>
    </Panel>
  );
}

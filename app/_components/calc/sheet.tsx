"use client";
/**
 * The calculation sheet: a tidy calculation pad. On the left what was entered (the inputs form,
 * generated from the type's fields); on the right what follows from it and why (checks, results
 * with their working and plots, tables, components, assumptions), recomputed live on the server
 * as the engineer types. Above both, the workflow bar; below, the check comments.
 *
 * Saving: drafts autosave (debounced PATCH naming the version they were based on). A stale save
 * (409: someone else saved first) keeps everything typed on screen, stops saving and offers to
 * reload; nothing is overwritten. What has not been saved is also kept in this browser
 * (localStorage) until it is, and leaving the page with unsaved changes asks first.
 */
import Link from "next/link";
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { keepPreviousData, useQuery, useQueryClient } from "@tanstack/react-query";
import type { CalcOutput, PartField, RawInputs, RawPart } from "@/lib/calc/core/types";
import { api, ApiError } from "@/lib/api-client";
import { Button, Notice, cx } from "../ui";
import { InputsForm, type FormValues } from "./inputs-form";
import { ResultsPad } from "./results";
import { WorkflowBar, type TransitionBody } from "./workflow-bar";
import { CommentsPanel, useComments } from "./comments";
import { ScreeningDialog } from "./screening";
import { MonteCarloRun } from "./monte-carlo";
import { partFromLibrary } from "./part-picker";
import { CheckCounts } from "./severity";
import { AttachmentsPanel } from "../attachments/attachments-panel";
import { STATUS_LABEL, dateTime, timeOfDay } from "./format";
import type { LibraryPart, SheetCalculation, SheetPermissions, SheetType } from "./types";

interface ComputeResponse {
  output: CalcOutput;
  summary: { pass: number; warning: number; fail: number };
}

type SaveState =
  | { kind: "idle" }
  | { kind: "saving" }
  | { kind: "saved"; version: number; at: number }
  | { kind: "error"; message: string }
  | { kind: "stale"; message: string };

interface Backup {
  baseVersion: number;
  /** The saved inputs and title the unsaved edits started from (for a three-way merge). */
  base: string;
  baseTitle: string;
  inputs: string;
  title: string;
  at: number;
}

/**
 * Put unsaved edits back on top of what the server has now: every input the user changed from
 * the state they started from takes the user's value; everything else keeps the server's (so
 * another person's saved changes to other fields survive).
 */
function mergeEdits(b: Backup, server: { inputs: Record<string, unknown>; title: string }): { inputs: Record<string, unknown>; title: string } {
  const mine = JSON.parse(b.inputs) as Record<string, unknown>;
  const base = JSON.parse(b.base) as Record<string, unknown>;
  const out: Record<string, unknown> = { ...server.inputs };
  for (const k of new Set([...Object.keys(mine), ...Object.keys(base)])) {
    if (JSON.stringify(mine[k]) !== JSON.stringify(base[k])) out[k] = mine[k];
  }
  return { inputs: out, title: b.title !== b.baseTitle ? b.title : server.title };
}

const backupKey = (id: string) => `loopwright:unsaved:${id}`;

function readBackup(id: string): Backup | null {
  try {
    const text = window.localStorage.getItem(backupKey(id));
    return text ? (JSON.parse(text) as Backup) : null;
  } catch {
    return null;
  }
}

/** A value that follows `value` after it has been still for `ms`. */
function useDebounced<T>(value: T, ms: number): T {
  const [v, setV] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setV(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return v;
}

/** Why the sheet cannot be edited now, or null when it can. */
function readOnlyReason(calc: SheetCalculation, perms: SheetPermissions): string | null {
  if (!perms.edit) return "Your role can read calculations but not change them.";
  if (!perms.writable) return perms.readOnlyMessage ?? "The workspace is read-only.";
  if (!perms.packUnlocked) return perms.packLockedMessage ?? "This calculation's pack is locked.";
  switch (calc.status) {
    case "draft":
      return null;
    case "in_check":
      return `This calculation is in check${calc.checker ? ` with ${calc.checker.name}` : ""}. It can be edited again once the checker returns it.`;
    case "approved":
      return "This calculation is approved. Reopen it as a draft to edit (its approval is then withdrawn).";
    case "issued":
      return `Revision ${calc.revision} is issued and cannot change. Start a new revision to edit.`;
  }
}

export function CalculationSheet({
  slug,
  projectId,
  projectName,
  initial,
  type,
  me,
  perms,
}: {
  slug: string;
  projectId: string;
  projectName: string;
  initial: SheetCalculation;
  type: SheetType;
  me: { id: string; name: string };
  perms: SheetPermissions;
}) {
  const qc = useQueryClient();
  const [calc, setCalc] = useState<SheetCalculation>(initial);
  const form = useForm<FormValues>({ defaultValues: initial.inputs as FormValues });
  const values = useWatch({ control: form.control }) as FormValues;
  const json = useMemo(() => JSON.stringify(values), [values]);
  const [title, setTitleState] = useState(initial.title);
  const titleRef = useRef(initial.title);
  const setTitle = useCallback((t: string) => {
    titleRef.current = t;
    setTitleState(t);
  }, []);

  const reason = readOnlyReason(calc, perms);
  const editable = reason === null;

  // ---- saving ------------------------------------------------------------------------------
  // What the server has: a ref for the save logic, the same in state for rendering.
  const [savedState, setSavedState] = useState(() => ({ json: JSON.stringify(initial.inputs), title: initial.title }));
  const saved = useRef(savedState);
  const markSaved = useCallback((v: { json: string; title: string }) => {
    saved.current = v;
    setSavedState(v);
  }, []);
  const versionRef = useRef(initial.version);
  const inflight = useRef<Promise<SheetCalculation | null> | null>(null);
  const [save, setSave] = useState<SaveState>({ kind: "saved", version: initial.version, at: initial.updatedAt });
  const [restore, setRestore] = useState<Backup | null>(null);
  const dirty = json !== savedState.json || title !== savedState.title;

  const doSave = useCallback(async (): Promise<SheetCalculation | null> => {
    while (inflight.current) await inflight.current.catch(() => null);
    const inputsJson = JSON.stringify(form.getValues());
    const t = titleRef.current;
    if (inputsJson === saved.current.json && t === saved.current.title) return null;
    const run = (async () => {
      setSave({ kind: "saving" });
      try {
        const body: { version: number; inputs?: RawInputs; title?: string } = { version: versionRef.current };
        if (inputsJson !== saved.current.json) body.inputs = JSON.parse(inputsJson) as RawInputs;
        if (t !== saved.current.title) body.title = t;
        const r = await api<{ calculation: SheetCalculation }>(`/api/w/${slug}/calculations/${initial.id}`, { method: "PATCH", body });
        versionRef.current = r.calculation.version;
        markSaved({ json: inputsJson, title: t });
        setCalc(r.calculation);
        setSave({ kind: "saved", version: r.calculation.version, at: r.calculation.updatedAt });
        if (JSON.stringify(form.getValues()) === inputsJson && titleRef.current === t) window.localStorage.removeItem(backupKey(initial.id));
        return r.calculation;
      } catch (e) {
        if (e instanceof ApiError && e.status === 409) setSave({ kind: "stale", message: e.message });
        else setSave({ kind: "error", message: e instanceof Error ? e.message : String(e) });
        throw e;
      }
    })();
    inflight.current = run;
    try {
      return await run;
    } finally {
      if (inflight.current === run) inflight.current = null;
    }
  }, [form, slug, initial.id, markSaved]);

  // Debounced autosave of drafts; stops after a stale save until the user reloads.
  useEffect(() => {
    if (!editable || !dirty || save.kind === "stale" || save.kind === "saving") return;
    const t = setTimeout(() => void doSave().catch(() => undefined), 800);
    return () => clearTimeout(t);
  }, [json, title, editable, dirty, save.kind, doSave]);

  // Keep what is not saved in this browser, so a crash, a closed tab or a stale save loses nothing.
  useEffect(() => {
    if (!dirty || !editable) return;
    const b: Backup = { baseVersion: versionRef.current, base: savedState.json, baseTitle: savedState.title, inputs: json, title, at: Date.now() };
    try {
      window.localStorage.setItem(backupKey(initial.id), JSON.stringify(b));
    } catch {
      // storage full or blocked: the warning before leaving still protects the input
    }
  }, [json, title, dirty, editable, initial.id, savedState]);

  // On opening: offer what this browser kept from an earlier visit that was never saved.
  useEffect(() => {
    const b = readBackup(initial.id);
    if (!b) return;
    if (b.inputs === JSON.stringify(initial.inputs) && b.title === initial.title) {
      window.localStorage.removeItem(backupKey(initial.id));
      return;
    }
    // Offered once the page has settled, so it never races the first render.
    const t = setTimeout(() => setRestore(b), 0);
    return () => clearTimeout(t);
  }, [initial.id, initial.inputs, initial.title]);

  // Warn before leaving with unsaved changes: closing or reloading the tab, and links in the app.
  const unsaved = (dirty && editable) || save.kind === "saving" || save.kind === "stale";
  useEffect(() => {
    if (!unsaved) return;
    const onBeforeUnload = (e: BeforeUnloadEvent) => {
      e.preventDefault();
      e.returnValue = "";
    };
    const onClick = (e: MouseEvent) => {
      const a = (e.target as Element | null)?.closest?.("a[href]");
      if (!a || e.defaultPrevented || e.button !== 0 || e.metaKey || e.ctrlKey || e.shiftKey || (a as HTMLAnchorElement).target === "_blank") return;
      if (!window.confirm("Your latest changes are not saved yet. Leave this page anyway? (They stay kept in this browser.)")) {
        e.preventDefault();
        e.stopPropagation();
      }
    };
    window.addEventListener("beforeunload", onBeforeUnload);
    document.addEventListener("click", onClick, true);
    return () => {
      window.removeEventListener("beforeunload", onBeforeUnload);
      document.removeEventListener("click", onClick, true);
    };
  }, [unsaved]);

  const reload = async () => {
    const r = await api<{ calculation: SheetCalculation }>(`/api/w/${slug}/calculations/${initial.id}`);
    const c = r.calculation;
    const kept = readBackup(initial.id);
    const server = { json: JSON.stringify(c.inputs), title: c.title };
    markSaved(server);
    versionRef.current = c.version;
    form.reset(c.inputs as FormValues);
    setTitle(c.title);
    setCalc(c);
    setSave({ kind: "saved", version: c.version, at: c.updatedAt });
    if (kept && (kept.inputs !== server.json || kept.title !== c.title)) setRestore(kept);
    void qc.invalidateQueries({ queryKey: ["comments", slug, initial.id] });
  };

  const putBack = (b: Backup) => {
    const merged = b.base ? mergeEdits(b, { inputs: JSON.parse(savedState.json) as Record<string, unknown>, title: savedState.title }) : { inputs: JSON.parse(b.inputs) as Record<string, unknown>, title: b.title };
    form.reset(merged.inputs as FormValues);
    setTitle(merged.title);
    setRestore(null);
  };

  // ---- live compute --------------------------------------------------------------------------
  const [initialJson] = useState(() => JSON.stringify(initial.inputs));
  const debounced = useDebounced(json, 300);
  const [lastGood, setLastGood] = useState<{ data: ComputeResponse; at: number } | null>(
    initial.results && initial.checkSummary ? { data: { output: initial.results as unknown as CalcOutput, summary: initial.checkSummary }, at: initial.updatedAt } : null,
  );
  const compute = useQuery({
    queryKey: ["compute", slug, type.id, debounced],
    queryFn: async ({ signal }) => {
      const r = await api<ComputeResponse>(`/api/w/${slug}/compute`, { body: { typeId: type.id, inputs: JSON.parse(debounced) as RawInputs }, signal });
      setLastGood({ data: r, at: Date.now() });
      return r;
    },
    enabled: perms.packUnlocked,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
    gcTime: 30_000,
    retry: false,
    initialData: debounced === initialJson && initial.results && initial.checkSummary ? { output: initial.results as unknown as CalcOutput, summary: initial.checkSummary } : undefined,
  });
  const computeError = compute.error instanceof ApiError ? compute.error : compute.error ? new ApiError(0, "network", (compute.error as Error).message) : null;
  const serverErrors = computeError?.status === 422 ? computeError.fields : {};
  const resultsStale = !!computeError || (debounced !== json && editable);
  const shown = compute.data ?? lastGood?.data ?? null;

  // ---- workflow ----------------------------------------------------------------------------
  const onTransition = async (body: TransitionBody) => {
    if (calc.status === "draft" && editable && (dirty || save.kind === "error")) await doSave();
    if (save.kind === "stale") throw new Error("Reload the saved version first: someone else saved a newer one.");
    const r = await api<{ calculation: SheetCalculation }>(`/api/w/${slug}/calculations/${initial.id}/transitions`, { body: { ...body, version: versionRef.current } });
    versionRef.current = r.calculation.version;
    markSaved({ json: JSON.stringify(r.calculation.inputs), title: r.calculation.title });
    setCalc(r.calculation);
    setSave({ kind: "saved", version: r.calculation.version, at: r.calculation.updatedAt });
    void qc.invalidateQueries({ queryKey: ["comments", slug, initial.id] });
  };
  const onChanged = (c: SheetCalculation) => {
    versionRef.current = c.version;
    setCalc(c);
  };

  // ---- screening -------------------------------------------------------------------------------
  const partField = type.fields.find((f): f is PartField => f.kind === "part");
  const [screening, setScreening] = useState<string | null>(null);
  const applyLibraryPart = async (partId: string) => {
    if (!partField) return;
    const key = ["parts", slug, partField.partKind];
    const cached = qc.getQueryData<LibraryPart[]>(key);
    // Screening reads the library afresh on the server; refetch when the cached list is older.
    const parts = cached?.some((x) => x.id === partId)
      ? cached
      : await qc.fetchQuery({
          queryKey: key,
          queryFn: ({ signal }) => api<{ parts: LibraryPart[] }>(`/api/w/${slug}/parts?kind=${partField.partKind}`, { signal }).then((r) => r.parts),
          staleTime: 0,
        });
    const p = parts.find((x) => x.id === partId);
    if (p) form.setValue(partField.key, partFromLibrary(p), { shouldDirty: true });
    setScreening(null);
  };
  const currentPart = partField ? (values[partField.key] as RawPart | undefined) : undefined;

  const comments = useComments(slug, initial.id);
  const lastReturn = calc.status === "draft" ? [...(comments.data ?? [])].reverse().find((c) => c.kind === "return" && c.revision === calc.revision) : undefined;

  const hasMonteCarlo = type.fields.some((f) => f.key === "mcTrials");
  const extras = hasMonteCarlo
    ? {
        "Tolerance analysis": (
          <MonteCarloRun
            slug={slug}
            typeId={type.id}
            getInputs={() => form.getValues()}
            disabled={!perms.packUnlocked || !!computeError}
            disabledReason={!perms.packUnlocked ? perms.packLockedMessage : computeError ? "Correct the inputs first." : undefined}
          />
        ),
      }
    : undefined;

  // ---- the page ------------------------------------------------------------------------------------
  const saveText =
    save.kind === "stale"
      ? "Not saved: someone saved a newer version"
      : save.kind === "saving"
        ? "Saving…"
        : save.kind === "error"
          ? `Not saved: ${save.message}`
          : dirty && editable
            ? "Unsaved changes…"
            : save.kind === "saved"
              ? `Saved · v${save.version} · ${timeOfDay(save.at)}`
              : "";

  return (
    <div>
      <nav className="mb-2 text-[13px] text-ink-3" aria-label="Breadcrumb">
        <Link href={`/w/${slug}/projects`} className="hover:text-ink">
          Projects
        </Link>{" "}
        /{" "}
        <Link href={`/w/${slug}/projects/${projectId}`} className="hover:text-ink">
          {projectName}
        </Link>{" "}
        / <span className="mono">{calc.number}</span>
      </nav>

      <header className="mb-3 flex flex-wrap items-end justify-between gap-3 border-b border-rule pb-3">
        <div className="min-w-0 flex-1">
          <div className="mb-0.5 flex flex-wrap items-center gap-x-2 text-[12px] uppercase tracking-[0.08em] text-ink-3">
            <span className="mono normal-case tracking-normal text-ink-2">{calc.number}</span>
            <span aria-hidden="true">·</span>
            <span>{type.title}</span>
            <span aria-hidden="true">·</span>
            <span className="normal-case tracking-normal">engine {calc.engineVersion}</span>
          </div>
          <input
            aria-label="Title"
            value={title}
            onChange={(e) => setTitle(e.target.value)}
            readOnly={!editable}
            className={cx("w-full max-w-3xl truncate rounded border border-transparent bg-transparent px-1 -mx-1 text-[22px] font-semibold leading-tight tracking-[-0.01em] text-ink focus:outline-none", editable && "hover:border-rule focus:border-copper focus:bg-white/70")}
          />
        </div>
        <div className="flex flex-col items-end gap-1 text-[12.5px]">
          <span role="status" aria-live="polite" data-testid="save-status" className={cx("mono", save.kind === "error" || save.kind === "stale" ? "text-fail" : "text-ink-2")}>
            {saveText}
          </span>
          <Link href={`/w/${slug}/projects/${projectId}/calculations/${initial.id}/history`} className="text-copper hover:underline">
            Revision history
          </Link>
        </div>
      </header>

      <WorkflowBar slug={slug} calc={calc} me={me} perms={perms} inputsValid={!computeError && !!shown && !resultsStale && save.kind !== "stale"} onTransition={onTransition} onChanged={onChanged} />

      <div className="mb-4 space-y-2">
        {save.kind === "stale" ? (
          <div role="alert" className="rounded-md border border-fail/40 bg-fail-wash px-3 py-2 text-[13.5px]">
            <p>
              <span className="mr-1.5 font-semibold">Not saved:</span>
              {save.message}
            </p>
            <p className="mt-1 text-ink-2">Your values stay on this page and in this browser. Reload to see the saved version; you can then put your values back.</p>
            <div className="mt-2 flex gap-2">
              <Button size="sm" variant="primary" onClick={() => void reload()}>
                Reload the saved version
              </Button>
            </div>
          </div>
        ) : null}
        {restore ? (
          <Notice tone="warning" title="Unsaved values kept in this browser">
            From {dateTime(restore.at)}, based on v{restore.baseVersion}.{" "}
            {editable ? (
              <>
                <button type="button" className="font-medium text-copper underline-offset-2 hover:underline" onClick={() => putBack(restore)}>
                  Put my values back
                </button>{" "}
                ·{" "}
              </>
            ) : null}
            <button
              type="button"
              className="font-medium text-ink-2 underline-offset-2 hover:underline"
              onClick={() => {
                window.localStorage.removeItem(backupKey(initial.id));
                setRestore(null);
              }}
            >
              Discard them
            </button>
          </Notice>
        ) : null}
        {lastReturn ? (
          <Notice tone="info" title={`Returned by ${lastReturn.author}`}>
            <span className="whitespace-pre-wrap">{lastReturn.body}</span>
          </Notice>
        ) : null}
        {reason && calc.status !== "draft" ? (
          <p className="text-[13px] text-ink-2" data-testid="read-only-reason">
            <span className="font-semibold text-ink">{STATUS_LABEL[calc.status]}:</span> {reason}
          </p>
        ) : reason ? (
          <Notice tone="info" title="Read only">
            {reason}
            {!perms.packUnlocked ? (
              perms.canManageBilling ? (
                <>
                  {" "}
                  <Link className="font-medium text-copper hover:underline" href={`/w/${slug}/billing`}>
                    Open billing
                  </Link>
                </>
              ) : (
                " Ask your workspace owner to unlock it."
              )
            ) : null}
          </Notice>
        ) : null}
        {calc.currentEngineVersion && calc.currentEngineVersion !== calc.engineVersion ? (
          <Notice tone="info">
            Computed with engine {calc.engineVersion}; the engine is now {calc.currentEngineVersion}. {editable ? "The next save recomputes with it." : ""}
          </Notice>
        ) : null}
      </div>

      <div className="grid items-start gap-5 lg:grid-cols-[minmax(360px,430px)_minmax(0,1fr)]">
        <aside aria-label="Inputs" className="rounded-lg border border-rule bg-sheet px-4 py-3 lg:sticky lg:top-3 lg:max-h-[calc(100vh-1.5rem)] lg:overflow-y-auto">
          <div className="mb-2 flex items-baseline justify-between">
            <h2 className="text-[15px] font-semibold">Inputs</h2>
            <span className="text-[12px] text-ink-3">as typed: 4k7, 2.2u, 10 kHz</span>
          </div>
          <InputsForm form={form} fields={type.fields} serverErrors={serverErrors} readOnly={!editable} slug={slug} onScreenParts={
              partField && perms.packUnlocked
                ? () => {
                    void qc.invalidateQueries({ queryKey: ["parts", slug] });
                    setScreening(JSON.stringify(form.getValues()));
                  }
                : undefined
            } />
        </aside>

        <main className="pad min-w-0 rounded-lg border border-rule px-5 py-4" aria-label="Results pad">
          <div className="mb-4 flex flex-wrap items-center justify-between gap-2 border-b border-rule pb-2">
            <div className="flex items-center gap-3 text-[13.5px]">
              <span className="text-[12px] uppercase tracking-[0.08em] text-ink-3">Summary</span>
              <CheckCounts summary={shown?.summary} />
            </div>
            <span className="text-[12px] text-ink-3" aria-live="polite">
              {compute.isFetching ? "Recomputing…" : shown ? `${type.title} · engine ${type.version}` : ""}
            </span>
          </div>
          {computeError && computeError.status === 422 ? (
            <div className="mb-4">
              <Notice tone="error" title="Inputs to correct">
                {computeError.message}
                {lastGood ? " The results below are for the last inputs that computed." : ""}
              </Notice>
            </div>
          ) : computeError ? (
            <div className="mb-4">
              <Notice tone="error">{computeError.message}</Notice>
            </div>
          ) : null}
          {!perms.packUnlocked ? (
            <div className="mb-4">
              <Notice tone="info" title="Stored results">
                {perms.packLockedMessage} The results shown are those saved with the calculation.
              </Notice>
            </div>
          ) : null}
          {shown ? (
            <div className={cx("transition-opacity", computeError && "opacity-55")}>
              <ResultsPad output={shown.output} extras={extras} />
            </div>
          ) : (
            <p className="text-ink-3">{compute.isFetching ? "Computing…" : "No results yet: complete the inputs."}</p>
          )}
        </main>
      </div>

      <div className="mt-6 grid gap-5 lg:grid-cols-[minmax(360px,430px)_minmax(0,1fr)]">
        <CommentsPanel slug={slug} calcId={initial.id} canComment={perms.edit && perms.writable} />
        <AttachmentsPanel
          slug={slug}
          calcId={initial.id}
          canEdit={perms.edit && perms.writable && calc.status !== "issued"}
          readOnlyReason={!perms.edit ? "Your role can read attachments but not change them." : !perms.writable ? perms.readOnlyMessage : calc.status === "issued" ? `Revision ${calc.revision} is issued: its attachments are part of the record.` : undefined}
        />
      </div>

      {partField ? (
        <ScreeningDialog
          open={screening !== null}
          onClose={() => setScreening(null)}
          slug={slug}
          typeId={type.id}
          inputs={screening ?? "{}"}
          currentPartId={currentPart?.partId}
          canUse={editable}
          onUse={(id) => void applyLibraryPart(id)}
        />
      ) : null}
    </div>
  );
}

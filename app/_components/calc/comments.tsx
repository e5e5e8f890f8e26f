"use client";
/** Review comments of a calculation, oldest first; returns stand out with their word. */
import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { Button, Notice, Tag, TextArea } from "../ui";
import { dateTime } from "./format";

export interface ReviewComment {
  id: string;
  revision: string;
  kind: "return" | "comment";
  body: string;
  at: number;
  author: string;
  authorId: string;
}

/** The comments of a calculation (shared by the sheet's panel and its "returned" notice). */
export function useComments(slug: string, calcId: string) {
  return useQuery({
    queryKey: ["comments", slug, calcId],
    queryFn: ({ signal }) => api<{ comments: ReviewComment[] }>(`/api/w/${slug}/calculations/${calcId}/comments`, { signal }).then((r) => r.comments),
  });
}

export function CommentsPanel({ slug, calcId, canComment }: { slug: string; calcId: string; canComment: boolean }) {
  const qc = useQueryClient();
  const { data, error } = useComments(slug, calcId);
  const [body, setBody] = useState("");
  const add = useMutation({
    mutationFn: (text: string) => api(`/api/w/${slug}/calculations/${calcId}/comments`, { body: { body: text } }),
    onSuccess: () => {
      setBody("");
      void qc.invalidateQueries({ queryKey: ["comments", slug, calcId] });
    },
  });
  return (
    <section aria-labelledby="comments-title" className="rounded-lg border border-rule bg-sheet">
      <header className="border-b border-rule px-4 py-2.5">
        <h2 id="comments-title" className="text-[14px]">
          Check comments
        </h2>
      </header>
      <div className="p-4">
        {error ? <Notice tone="error">{(error as Error).message}</Notice> : null}
        {data && data.length === 0 ? <p className="text-[13px] text-ink-3">No comments yet.</p> : null}
        <ol className="space-y-3" aria-label="Comments">
          {data?.map((c) => (
            <li key={c.id} className="border-l-2 border-rule-strong pl-3" data-comment-kind={c.kind}>
              <div className="flex flex-wrap items-center gap-2 text-[12.5px] text-ink-2">
                <span className="font-medium text-ink">{c.author}</span>
                {c.kind === "return" ? <Tag tone="copper">returned to draft</Tag> : null}
                <span className="mono text-ink-3">
                  Rev {c.revision} · {dateTime(c.at)}
                </span>
              </div>
              <p className="mt-0.5 whitespace-pre-wrap text-[13.5px]">{c.body}</p>
            </li>
          ))}
        </ol>
        {canComment ? (
          <form
            className="mt-4 space-y-2"
            onSubmit={(e) => {
              e.preventDefault();
              if (body.trim()) add.mutate(body.trim());
            }}
          >
            <label htmlFor="new-comment" className="text-[13px] font-medium text-ink-2">
              Add a comment
            </label>
            <TextArea id="new-comment" rows={2} value={body} onChange={(e) => setBody(e.target.value)} />
            {add.error ? <Notice tone="error">{(add.error as Error).message}</Notice> : null}
            <Button type="submit" size="sm" disabled={add.isPending || !body.trim()}>
              Add comment
            </Button>
          </form>
        ) : null}
      </div>
    </section>
  );
}

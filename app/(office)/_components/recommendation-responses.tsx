"use client";

import { useFormatter, useTranslations } from "next-intl";
import { useActionState, useEffect, useRef } from "react";
import { RESPONSE_BODY_MAX } from "@/lib/digs/recommendation-response";
import { type RespondState, respondAction } from "../digs/[digId]/actions";

export interface ResponseItem {
  id: string;
  userName: string;
  userRole: "rep" | "grower" | "supervisor" | "admin";
  kind: "acknowledged" | "comment";
  body: string | null;
  createdAt: string;
}

/**
 * The answers to a dig's recommendation and, for those who may answer, the acknowledge button and a
 * comment form. Works without JavaScript through the server action; the server re-checks who may.
 */
export function RecommendationResponses({
  digSiteId,
  responses,
  canAcknowledge,
  acknowledged,
  canComment,
  headingLevel = 3,
}: {
  digSiteId: string;
  responses: readonly ResponseItem[];
  canAcknowledge: boolean;
  acknowledged: boolean;
  canComment: boolean;
  headingLevel?: 2 | 3;
}) {
  const t = useTranslations("grower.responses");
  const format = useFormatter();
  const action = respondAction.bind(null, digSiteId);
  const [ackState, ackAction, ackPending] = useActionState<RespondState, FormData>(action, null);
  const [commentState, commentAction, commentPending] = useActionState<RespondState, FormData>(action, null);
  const formRef = useRef<HTMLFormElement>(null);
  useEffect(() => {
    if (commentState && "data" in commentState) formRef.current?.reset();
  }, [commentState]);
  const Heading = headingLevel === 2 ? "h2" : "h3";
  const bodyId = `comment-${digSiteId}`;
  const errorId = `comment-error-${digSiteId}`;
  const commentError =
    commentState && "error" in commentState ? (commentState.fieldErrors?.body ?? commentState.error) : null;
  const isAcknowledged = acknowledged || (ackState !== null && "data" in ackState);

  return (
    <div className="mt-3 space-y-3">
      <Heading className="text-lg font-bold">{t("heading")}</Heading>
      {responses.length === 0 ? (
        <p className="text-soil-700">{t("none")}</p>
      ) : (
        <ul className="space-y-2">
          {responses.map((r) => (
            <li
              key={r.id}
              className={
                r.kind === "acknowledged" ? "notice-ok" : "rounded-lg border border-soil-200 bg-soil-50 p-3"
              }
            >
              <p className="font-semibold">
                {r.kind === "acknowledged"
                  ? t("acknowledgedBy", { name: r.userName })
                  : t("commentBy", { name: r.userName, role: t(`roles.${r.userRole}`) })}{" "}
                <span className="text-sm font-normal text-soil-700">
                  <time dateTime={r.createdAt}>
                    {t("at", {
                      time: format.dateTime(new Date(r.createdAt), {
                        dateStyle: "medium",
                        timeStyle: "short",
                      }),
                    })}
                  </time>
                </span>
              </p>
              {r.body ? <p className="mt-1 whitespace-pre-line">{r.body}</p> : null}
            </li>
          ))}
        </ul>
      )}

      {canAcknowledge ? (
        isAcknowledged ? (
          <p className="notice-ok" role="status">
            {t("acknowledged")}
          </p>
        ) : (
          <form action={ackAction}>
            <input type="hidden" name="kind" value="acknowledged" />
            <button type="submit" className="btn-primary" disabled={ackPending} aria-disabled={ackPending}>
              {ackPending ? t("acknowledging") : t("acknowledge")}
            </button>
            {ackState && "error" in ackState ? (
              <p className="field-error" role="alert">
                {t("failed", { error: ackState.error })}
              </p>
            ) : null}
          </form>
        )
      ) : null}

      {canComment ? (
        <form ref={formRef} action={commentAction} className="space-y-2">
          <input type="hidden" name="kind" value="comment" />
          <label htmlFor={bodyId} className="field-label">
            {t("comment")}
          </label>
          <p id={`${bodyId}-hint`} className="text-sm text-soil-700">
            {t("commentHint")}
          </p>
          <textarea
            id={bodyId}
            name="body"
            required
            maxLength={RESPONSE_BODY_MAX}
            rows={3}
            className="field-input py-2"
            aria-invalid={commentError ? true : undefined}
            aria-describedby={commentError ? `${bodyId}-hint ${errorId}` : `${bodyId}-hint`}
          />
          {commentError ? (
            <p id={errorId} className="field-error" role="alert">
              {t("failed", { error: commentError })}
            </p>
          ) : null}
          {commentState && "data" in commentState ? (
            <p className="text-sm font-semibold text-sprout-700" role="status">
              {t("sent")}
            </p>
          ) : null}
          <button
            type="submit"
            className="btn-secondary"
            disabled={commentPending}
            aria-disabled={commentPending}
          >
            {commentPending ? t("sending") : t("send")}
          </button>
        </form>
      ) : null}
    </div>
  );
}

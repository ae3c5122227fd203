/**
 * An exam's status as a word plus a shape, never colour alone (PRODUCT.md, "Status words and
 * marks"). Exams share the item lifecycle's shapes (open square draft, filled square published,
 * crossed square retired) since both are bank content.
 */
import { ItemStatusMark } from "./item-status-mark";

export const EXAM_STATUS_WORDS = { draft: "Draft", published: "Published", retired: "Retired" } as const;

export function ExamStatusMark({ status, detail }: { status: keyof typeof EXAM_STATUS_WORDS; detail?: string }) {
  return <ItemStatusMark status={status} detail={detail} />;
}

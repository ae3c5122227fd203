import { Link } from "react-router";
import { Button, buttonClass } from "./button";

/** The end of a filter form: apply it, and (when anything is filtered) go back to the whole list. */
export function FilterActions({ clearTo, filtered, className = "" }: { clearTo: string; filtered: boolean; className?: string }) {
  return (
    <div className={`flex items-start gap-2 ${className}`}>
      <Button type="submit" variant="secondary">
        Show
      </Button>
      {filtered ? (
        <Link to={clearTo} className={buttonClass("quiet")}>
          Clear
        </Link>
      ) : null}
    </div>
  );
}

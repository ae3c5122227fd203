import { useLoaderData } from "react-router";
import { z } from "zod";
import { BenchWorkbench } from "~/components/bench/bench-workbench";
import { ExerciseList } from "~/components/bench/exercise-panel";
import { ModelNotes } from "~/components/bench/model-notes";
import { CautionFooter } from "~/components/caution";
import { EXERCISES, FREE_PLAY, findExercise } from "./exercises";
import type { Route } from "./+types/index";

/** ?exercise=<id> loads a guided exercise; anything else is free play. */
const searchSchema = z.object({ exercise: z.string().max(80).optional() });

export async function loader({ request }: Route.LoaderArgs) {
  const params = searchSchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  const exercise = params.success ? findExercise(params.data.exercise) : null;
  return { exerciseId: exercise?.id ?? null };
}

export default function BenchPage() {
  const { exerciseId } = useLoaderData<typeof loader>();
  const exercise = findExercise(exerciseId);
  return (
    <>
      <h1 className="text-3xl font-semibold">Bench</h1>
      <p className="mt-1 mb-6 max-w-3xl text-muted">
        A lung model on a ventilator, for practice. Choose a mode and a patient, watch pressure, flow and volume breath by breath,
        and see what each change does. It runs in your browser; nothing here is recorded.
      </p>
      <BenchWorkbench key={exercise?.id ?? "free-play"} exercise={exercise} freePlay={FREE_PLAY} />
      <ExerciseList exercises={EXERCISES} activeId={exercise?.id ?? null} />
      <ModelNotes />
      <CautionFooter />
    </>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Bench · Tidemark" }];

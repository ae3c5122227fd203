import { Link, useLoaderData } from "react-router";
import { codeFromMagicLink, readPendingSignIn, redeemCode } from "~/auth/sign-in.server";
import { AuthFrame } from "~/components/auth-frame";
import { env } from "~/config/env.server";
import type { Route } from "./+types/login-magic";

export async function loader({ request }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("t");
  const code = token ? await codeFromMagicLink(token) : null;
  if (!code) return { demoMode: env().demoMode, message: "This sign-in link is not valid. Ask for a new code." };
  if (!(await readPendingSignIn(request))) {
    return {
      demoMode: env().demoMode,
      message: "Sign-in links work only in the browser where you asked for the code. Open it there, or type the code instead.",
    };
  }
  const result = await redeemCode(request, code);
  if (result instanceof Response) throw result;
  return { demoMode: env().demoMode, message: result.ok ? "Signed in." : result.message };
}

export default function LoginMagic() {
  const { demoMode, message } = useLoaderData<typeof loader>();
  return (
    <AuthFrame title="Sign-in link" demoMode={demoMode}>
      <p role="alert" className="mb-6 rounded-md border-l-4 border-coral bg-coral-wash px-4 py-3">
        {message}
      </p>
      <Link to="/login" className="font-semibold">
        Ask for a new code
      </Link>
    </AuthFrame>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Sign-in link · Tidemark" }];

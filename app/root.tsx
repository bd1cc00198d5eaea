import {
  Form,
  isRouteErrorResponse,
  Link,
  Links,
  Meta,
  NavLink,
  Outlet,
  Scripts,
  ScrollRestoration,
  useRouteLoaderData,
} from "react-router";
import { z } from "zod";
import type { Route } from "./+types/root";
import "./app.css";
import { Logo } from "./components/logo";
import { ThemeToggle } from "./components/theme-toggle";
import { getUser } from "./utils/auth.server";
import { useNonce } from "./utils/nonce";
import { themeFromCookie } from "./utils/theme";

// zod compiles object schemas with `new Function` after probing whether it may; the page's
// Content-Security-Policy forbids eval and reports even the probe. In the browser it interprets.
if (typeof document !== "undefined") z.config({ jitless: true });

export const links: Route.LinksFunction = () => [
  { rel: "icon", href: "data:image/svg+xml,%3Csvg xmlns='http://www.w3.org/2000/svg' viewBox='0 0 16 16'%3E%3Ccircle cx='4' cy='8' r='3' fill='%230f6c6e'/%3E%3Ccircle cx='12' cy='8' r='3' fill='%23b55a22'/%3E%3C/svg%3E" },
];

export async function loader(args: Route.LoaderArgs) {
  const user = await getUser(args);
  return { user, theme: themeFromCookie(args.request.headers.get("Cookie")) };
}

export function Layout({ children }: { children: React.ReactNode }) {
  const data = useRouteLoaderData<typeof loader>("root");
  const nonce = useNonce();
  return (
    <html lang="en" data-theme={data?.theme ?? undefined}>
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <Meta />
        <Links />
        {/* Follow the system theme until the user picks one (no flash: runs before paint). */}
        <script
          nonce={nonce}
          suppressHydrationWarning
          dangerouslySetInnerHTML={{
            __html: `if(!document.documentElement.dataset.theme&&matchMedia('(prefers-color-scheme: dark)').matches)document.documentElement.dataset.theme='dark'`,
          }}
        />
      </head>
      <body className="min-h-screen">
        <Header user={data?.user ?? null} />
        {children}
        <ScrollRestoration />
        <Scripts />
      </body>
    </html>
  );
}

const navigation = [
  ["/dashboard", "Mechanisms"],
  ["/realize", "ODE to mechanism"],
  ["/api", "API"],
  ["/settings/tokens", "Tokens"],
] as const;

function Header({ user }: { user: { name: string; email: string; verified: boolean } | null }) {
  return (
    <header className="border-b border-line bg-surface/80 backdrop-blur">
      <div className="mx-auto flex min-h-14 max-w-[96rem] flex-wrap items-center gap-x-6 gap-y-2 px-4 py-2 sm:px-6">
        <Link to={user ? "/dashboard" : "/"} className="flex items-center gap-2 text-ink no-underline">
          <Logo />
          <span className="hidden text-base font-semibold tracking-tight sm:inline">Mechweave</span>
        </Link>
        {user && (
          <nav className="flex gap-4 text-sm">
            {navigation.map(([to, label]) => (
              <NavLink key={to} to={to} className={({ isActive }) => (isActive ? "font-medium text-ink" : "text-muted hover:text-ink")}>
                {label}
              </NavLink>
            ))}
          </nav>
        )}
        <div className="ml-auto flex items-center gap-3 text-sm">
          <ThemeToggle />
          {user ? (
            <>
              {!user.verified && <Link to="/verify-email" className="text-danger">Confirm your e-mail</Link>}
              <span className="hidden text-muted sm:inline" title={user.email}>{user.name}</span>
              <Form method="post" action="/sign-out">
                <button className="btn" type="submit">Sign out</button>
              </Form>
            </>
          ) : (
            <>
              <Link to="/sign-in" className="btn">Sign in</Link>
              <Link to="/sign-up" className="btn btn-primary">Create account</Link>
            </>
          )}
        </div>
      </div>
    </header>
  );
}

export default function App() {
  return <Outlet />;
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let title = "Something went wrong";
  let detail = "The server could not finish this request. Your saved work is safe; try again.";
  if (isRouteErrorResponse(error)) {
    title = error.status === 404 ? "Not found" : error.status === 403 ? "Not allowed" : `Error ${error.status}`;
    detail = typeof error.data === "object" && error.data?.error ? error.data.error : error.statusText || detail;
  } else if (import.meta.env.DEV && error instanceof Error) {
    detail = error.message;
  }
  return (
    <main className="mx-auto max-w-xl px-6 py-20">
      <h1>{title}</h1>
      <p className="mt-3 text-muted">{detail}</p>
      <Link to="/dashboard" className="btn mt-6">Back to your mechanisms</Link>
    </main>
  );
}

"use client";

/**
 * The last resort: the root layout itself failed, so this page brings its own <html> and inline styles (the app's
 * stylesheet and fonts may not have loaded). Paper, ink and signal teal as everywhere else.
 */
export default function GlobalError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <html lang="en">
      <body style={{ margin: 0, minHeight: "100vh", background: "#F7F5F0", color: "#1C2430", fontFamily: "system-ui, sans-serif" }}>
        <main style={{ maxWidth: "36rem", margin: "0 auto", padding: "4rem 1.5rem" }}>
          <p style={{ margin: 0, fontWeight: 600, color: "#0F766E" }}>Quell</p>
          <h1 style={{ margin: "0.5rem 0 0", fontSize: "1.5rem", fontWeight: 600 }}>Quell stopped</h1>
          <p role="alert" style={{ marginTop: "0.75rem", color: "#5B6472" }}>
            Something unexpected stopped the whole page. Nothing you saved is lost; try again, or reload in a moment.
          </p>
          {error.digest && (
            <p style={{ marginTop: "0.5rem", fontSize: "0.875rem", color: "#5B6472" }}>
              Reference for the server log: <span style={{ fontFamily: "ui-monospace, monospace", color: "#1C2430" }}>{error.digest}</span>
            </p>
          )}
          <button
            type="button"
            onClick={reset}
            style={{ marginTop: "1.5rem", padding: "0.375rem 0.75rem", border: 0, borderRadius: "0.25rem", background: "#0F766E", color: "#FFFFFF", font: "inherit", fontWeight: 500, cursor: "pointer" }}
          >
            Try again
          </button>
        </main>
      </body>
    </html>
  );
}

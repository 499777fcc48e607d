/** The page's own look: a dark bench panel, amber for light, cyan for volts. */
import { css } from 'lit';

export const workbenchStyles = css`
  :host {
    --gt-bg: #14171c;
    --gt-panel: #1a1e24;
    --gt-panel-2: #222831;
    --gt-input: #10141a;
    --gt-line: #2c333d;
    --gt-text: #e2e6ea;
    --gt-muted: #9aa3ad;
    --gt-accent: #ffb547;
    --gt-cyan: #58c4dc;
    --gt-bad: #ff6b6b;
    --gt-warn: #ffb547;
    --gt-good: #7bd88f;
    display: flex;
    flex-direction: column;
    gap: 0.55rem;
    min-height: 100vh;
    box-sizing: border-box;
    padding: 0.7rem 0.9rem 0;
    background: var(--gt-bg);
    color: var(--gt-text);
    font-family: system-ui, -apple-system, 'Segoe UI', sans-serif;
  }
  header { display: flex; align-items: baseline; gap: 1rem; }
  h1 { font-size: 1.15rem; margin: 0; font-weight: 600; letter-spacing: 0.01em; }
  h1 .glow { color: var(--gt-accent); text-shadow: 0 0 10px rgba(255, 181, 71, 0.55); }
  .title { color: var(--gt-muted); font-size: 0.9rem; flex: 1; overflow: hidden; text-overflow: ellipsis; white-space: nowrap; }
  .notice { font-size: 0.82rem; padding: 0.35rem 0.6rem; border-radius: 4px; display: flex; gap: 0.6rem; align-items: center; }
  .notice.error { background: rgba(255, 107, 107, 0.12); border: 1px solid rgba(255, 107, 107, 0.5); color: #ffb3b3; }
  .notice.info { background: rgba(88, 196, 220, 0.1); border: 1px solid rgba(88, 196, 220, 0.4); }
  .notice button { margin-left: auto; background: none; border: none; color: inherit; font-size: 1rem; cursor: pointer; }
  .split { display: grid; grid-template-columns: minmax(22rem, 30rem) minmax(0, 1fr); gap: 0.8rem; flex: 1; min-height: 0; }
  section { background: var(--gt-panel); border: 1px solid var(--gt-line); border-radius: 6px; padding: 0.6rem 0.7rem; min-width: 0; }
  .settings { overflow: auto; max-height: calc(100vh - 17rem); }
  footer { position: sticky; bottom: 0; background: #101317; border-top: 1px solid var(--gt-line); padding: 0.45rem 0.2rem 0.55rem; margin: 0 -0.9rem; padding-left: 0.9rem; padding-right: 0.9rem; z-index: 5; }
  @media (max-width: 1000px) { .split { grid-template-columns: 1fr; } .settings { max-height: none; } }
`;

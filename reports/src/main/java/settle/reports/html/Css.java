package settle.reports.html;

/** The report's style sheet: readable on a laptop, printable, no web fonts. */
final class Css {

    private Css() {
    }

    static final String SHEET = """
            :root { --ink: #1d1d1f; --muted: #5a5a60; --rule: #d8d8dc; --shade: #f4f4f6; --accent: #0072B2; }
            * { box-sizing: border-box; }
            body { margin: 0; color: var(--ink); background: #ffffff;
              font: 15px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, "DejaVu Sans", sans-serif; }
            header, main, footer { max-width: 1180px; margin: 0 auto; padding: 0 24px; }
            header { padding-top: 20px; border-bottom: 1px solid var(--rule); }
            h1 { font-size: 1.6em; margin: 0.2em 0; }
            h2 { font-size: 1.3em; margin: 1.6em 0 0.4em; padding-bottom: 4px; border-bottom: 2px solid var(--accent); }
            h3 { font-size: 1.05em; margin: 1.2em 0 0.3em; }
            p { max-width: 80ch; }
            .lede { color: var(--muted); margin-top: 0; }
            .warning { background: #fff3e0; border-left: 4px solid #D55E00; padding: 6px 10px; max-width: none; }
            .note { color: var(--muted); font-size: 0.92em; }
            nav ul { list-style: none; padding: 0; margin: 8px 0 12px; display: flex; flex-wrap: wrap; gap: 4px 14px; }
            nav a { color: var(--accent); text-decoration: none; }
            nav a:hover { text-decoration: underline; }
            .pick { background: #eef6fb; border-left: 5px solid var(--accent); padding: 4px 14px; margin: 10px 0; }
            .pick p { max-width: none; }
            ul.sentences > li { margin: 6px 0; }
            ul.descriptive { color: var(--muted); font-size: 0.92em; margin: 2px 0 6px; }
            table { border-collapse: collapse; margin: 8px 0 14px; font-size: 0.88em; }
            caption { text-align: left; color: var(--muted); padding: 4px 0; caption-side: top; }
            th, td { padding: 3px 8px; border-bottom: 1px solid var(--rule); text-align: left; vertical-align: top; }
            thead th { background: var(--shade); border-bottom: 2px solid #b8b8c0; position: sticky; top: 0; }
            td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
            td.detected { font-weight: 600; }
            th.arm { white-space: nowrap; }
            table.verdict-table { font-size: 0.84em; }
            table.verdict-table th, table.verdict-table td { padding: 3px 6px; }
            tr.baseline th, tr.baseline td { background: #fafafa; }
            tr.diverged td { color: #B00000; }
            tr.missing td { color: var(--muted); font-style: italic; }
            table.ball-table tbody { border-bottom: 2px solid #b8b8c0; }
            table.ball-table td.over { white-space: nowrap; }
            tr.diagnosis td { color: var(--ink); white-space: normal; max-width: 70ch; padding-bottom: 6px; }
            tbody[data-state="reached"] tr.diagnosis td { color: #006b3c; }
            .chart-note { margin-top: 0; }
            .scroll { overflow-x: auto; }
            .scroll.tall { max-height: 520px; overflow-y: auto; }
            svg.swatch { vertical-align: -2px; margin-right: 6px; }
            .chart { display: block; max-width: 100%; height: auto; margin: 6px 0; font-size: 11px; }
            .chart .grid { stroke: #ececf0; stroke-width: 1; }
            .chart .frame { fill: none; stroke: #9a9aa2; stroke-width: 1; }
            .chart .tick { fill: var(--muted); font-size: 11px; }
            .chart .axis-title { fill: var(--ink); font-size: 12px; }
            .chart .row-label { fill: var(--ink); font-size: 12px; }
            .chart .row-shade { fill: #f6f6f8; }
            .chart .note { fill: var(--muted); font-size: 11px; }
            .chart .series { stroke-width: 1.8; stroke-linejoin: round; }
            .chart .series.predicted { stroke-width: 1.6; }
            .chart .band { opacity: 0.14; }
            .chart .series.rate-replicate { stroke-width: 0.8; opacity: 0.55; }
            .chart .mark-label { font-size: 10px; }
            .chart .median { stroke-width: 2.4; }
            .chart .reference { stroke: #333333; stroke-dasharray: 4 3; }
            .chart .span { fill: #5a5a60; opacity: 0.13; }
            .chart .snapshot { opacity: 0.55; }
            .chart .cell.empty { fill: #f2f2f2; }
            .chart .cell-text { fill: #111111; font-size: 11px; }
            .chart .cell-text.light { fill: #ffffff; }
            ul.legend { list-style: none; padding: 0; margin: 2px 0 10px; display: flex; flex-wrap: wrap; gap: 2px 18px;
              font-size: 0.9em; }
            .multiples { display: flex; flex-wrap: wrap; gap: 6px 14px; }
            figure.panel { margin: 0; }
            figure.panel figcaption { text-align: center; font-size: 0.9em; margin-top: -4px; overflow-wrap: anywhere;
              max-width: 290px; }
            figure.heat figcaption { max-width: none; }
            dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: 2px 16px; font-size: 0.9em; }
            dl.facts dt { color: var(--muted); }
            dl.facts dd { margin: 0; overflow-wrap: anywhere; }
            code, pre { font-family: ui-monospace, "DejaVu Sans Mono", Menlo, Consolas, monospace; font-size: 0.9em; }
            code { background: var(--shade); padding: 1px 4px; overflow-wrap: anywhere; }
            pre.plan { background: var(--shade); padding: 10px 12px; overflow-x: auto; border: 1px solid var(--rule); }
            footer { color: var(--muted); font-size: 0.85em; padding: 24px; border-top: 1px solid var(--rule);
              margin-top: 32px; }
            @media print {
              body { font-size: 10.5pt; }
              nav { display: none; }
              header, main, footer { max-width: none; padding: 0; }
              .scroll, .scroll.tall { max-height: none; overflow: visible; }
              thead th { position: static; }
              section { break-inside: auto; }
              .chart, figure, table, .pick { break-inside: avoid; }
              h2, h3 { break-after: avoid; }
            }
            """;
}

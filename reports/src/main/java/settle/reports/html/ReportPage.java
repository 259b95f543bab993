package settle.reports.html;

import java.util.ArrayList;
import java.util.List;
import settle.reports.html.sections.Drawing;
import settle.reports.html.sections.Section;
import settle.reports.html.sections.Sections;
import settle.reports.metrics.Replicates;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.format.Manifest;
import settle.reports.format.Study;

/**
 * {@code report.html}: one self-contained page (inline CSS and SVG, no script, a Content-Security-Policy
 * that forbids every fetch) with the sections of {@link #SECTIONS}, each a {@code <section>} with that id.
 * Every string from the study (arm, feature and class names, the plan text, paths) is escaped.
 *
 * <p>This class writes the page's skeleton: the head and its style sheet, the header with the study in one line and
 * the navigation, each section of {@link Sections#inOrder()} in its element (guarded: a section that throws is
 * replaced by a notice), and the footer. What each section shows is its own class in
 * {@code settle.reports.html.sections}.
 */
public final class ReportPage {

    /** Section ids, in page order. */
    public static final List<String> SECTIONS = Sections.inOrder().stream().map(Section::id).toList();

    /** The Content-Security-Policy of the page: nothing may be fetched; inline style and data images only. */
    public static final String CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:";

    private final StudyAnalysis analysis;
    private final Study study;
    private final Manifest manifest;
    private final HtmlWriter w;
    private final Drawing drawing;
    private final List<String> failed = new ArrayList<>();

    /**
     * A rendered page.
     *
     * @param html the page
     * @param failedSections "id (what went wrong)" for each section that could not be drawn (and says so on the
     *     page); empty when every section was drawn
     */
    public record Rendered(String html, List<String> failedSections) {

        public Rendered {
            failedSections = List.copyOf(failedSections);
        }
    }

    private ReportPage(StudyAnalysis analysis) {
        this.analysis = analysis;
        this.study = analysis.study();
        this.manifest = study.manifest();
        this.w = new HtmlWriter(1 << 18);
        this.drawing = new Drawing(w, analysis);
    }

    /**
     * @param analysis the analysed study
     * @return the page
     */
    public static String render(StudyAnalysis analysis) {
        return renderPage(analysis).html();
    }

    /**
     * Renders every section; a section that fails (a fault in settle, not in the study) is replaced by one that
     * says so, so the rest of the report is still written.
     *
     * @param analysis the analysed study
     * @return the page and the sections that could not be drawn
     */
    public static Rendered renderPage(StudyAnalysis analysis) {
        ReportPage page = new ReportPage(analysis);
        page.page();
        return new Rendered(page.w.toString(), page.failed);
    }

    /**
     * Writes the page: head (title, policy, style sheet), header (the study in one line, a warning for missing or
     * diverged replicates, the navigation), every section in order, each {@link #guarded}, and the footer.
     */
    private void page() {
        String name = manifest.study();
        openPage(w, "settle report: " + name);
        w.open("header");
        w.element("h1", "Study " + name + ": does decay shrink the noise ball?");
        w.open("p", "class", "lede");
        int epochs = Replicates.epochs(study);
        w.text(manifest.model() + " on " + manifest.dataSource() + " (" + manifest.trainRows() + " training rows, "
                + manifest.testRows() + " test rows); " + study.armCount() + " arms × " + study.replicateCount()
                + " seed-paired replicates; " + epochs + " epochs of " + manifest.updatesPerEpoch() + " updates. "
                + "Baseline arm: " + manifest.baseline() + ".");
        w.close("p");
        if (study.missing() > 0 || study.diverged() > 0) {
            w.open("p", "class", "warning");
            List<String> parts = new ArrayList<>();
            if (study.missing() > 0) {
                parts.add(study.missing() + " replicate" + (study.missing() == 1 ? " is" : "s are")
                        + " missing: this is a partial study (run it again to finish it); the verdict pairs the "
                        + analysis.pairedReplicates().length + " replicate indices present in every arm");
            }
            if (study.diverged() > 0) {
                parts.add(study.diverged() + " replicate" + (study.diverged() == 1 ? "" : "s")
                        + " diverged: they count as the worst value in the verdict and are left out of summaries");
            }
            w.text(String.join("; ", parts) + ".");
            w.close("p");
        }
        w.open("nav");
        w.open("ul");
        for (Section section : Sections.inOrder()) {
            w.open("li").element("a", section.navigation(), "href", "#" + section.id()).close("li");
        }
        w.close("ul");
        w.close("nav");
        w.close("header").newline();
        w.open("main").newline();
        for (Section section : Sections.inOrder()) {
            guarded(section);
        }
        w.close("main").newline();
        w.open("footer");
        w.text("Written by settle " + manifest.toolVersion() + " from the study directory; rebuild with "
                + "settle report " + study.directory() + ".");
        w.close("footer").newline();
        closePage(w);
    }

    /**
     * Starts a page of settle's: the doctype, the head (charset, {@link #CSP}, viewport, the title, the report's
     * style sheet) and the opening of the body. Every page settle writes (the report, the probe's page) starts so.
     *
     * @param w an empty writer
     * @param title the page's title
     */
    public static void openPage(HtmlWriter w, String title) {
        openPage(w, title, "");
    }

    /**
     * As {@link #openPage(HtmlWriter, String)}, with rules of the page's own after the report's style sheet.
     *
     * @param css the page's own rules (from the code, never from a study)
     */
    public static void openPage(HtmlWriter w, String title, String css) {
        w.doctype().open("html", "lang", "en").newline();
        w.open("head").newline();
        w.empty("meta", "charset", "utf-8").newline();
        w.empty("meta", "http-equiv", "Content-Security-Policy", "content", CSP).newline();
        w.empty("meta", "name", "viewport", "content", "width=device-width, initial-scale=1").newline();
        w.element("title", title).newline();
        w.styleSheet(Css.SHEET + css).newline();
        w.close("head").newline();
        w.open("body").newline();
    }

    /** Ends a page begun by {@link #openPage}: closes the body and the html element. */
    public static void closePage(HtmlWriter w) {
        w.close("body").newline();
        w.close("html").newline();
    }

    /**
     * Writes a section: its element, its heading and what it draws. When it throws, drops what it wrote and writes in
     * its place a section that says it could not be drawn, and records it in {@link #failed}.
     */
    private void guarded(Section section) {
        HtmlWriter.Mark mark = w.mark();
        try {
            open(section.id(), section.heading());
            section.draw(drawing);
            close();
        } catch (RuntimeException e) {
            w.rollback(mark);
            open(section.id(), section.navigation());
            w.element("p", "This section could not be drawn (" + e + "). That is a fault in settle, not in the study; "
                    + "the other sections stand.", "class", "warning");
            close();
            failed.add(section.id() + " (" + e + ")");
        }
    }

    /** Opens a {@code <section>} with its heading. */
    private void open(String id, String heading) {
        w.open("section", "id", id).newline();
        w.element("h2", heading);
    }

    /** Closes the section opened last. */
    private void close() {
        w.close("section").newline();
    }
}

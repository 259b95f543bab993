package settle.reports;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import settle.reports.html.ReportPage;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.metrics.VerdictSummary;
import settle.reports.stats.VerdictOptions;
import settle.input.BadInputException;
import settle.reports.format.AtomicFile;
import settle.reports.format.Study;
import settle.reports.format.StudyFormat;
import settle.reports.format.StudyReader;

/**
 * Builds {@code report.html} and {@code summary.csv} in a study directory, from its files only (study
 * directory format 2).
 */
public final class Report {


    /**
     * What was written.
     *
     * @param report the report's path
     * @param summary the summary's path
     * @param replicates replicates planned (arms × replicates)
     * @param missing replicate files missing (a partial study)
     * @param diverged replicates that diverged
     * @param failedSections "id (what went wrong)" for each section of the report that could not be drawn (it says so
     *     in its place; a fault in settle); empty when the whole report was drawn
     * @param verdict the verdict in words, for the terminal and the JSON summary
     */
    public record Outcome(Path report, Path summary, int replicates, int missing, int diverged,
            List<String> failedSections, VerdictSummary verdict) {

        public Outcome {
            failedSections = List.copyOf(failedSections);
        }

        /** @return true when some replicate files are missing */
        public boolean partial() {
            return missing > 0;
        }
    }

    private Report() {
    }

    /**
     * Reads the study directory, analyses it and writes both files atomically (first removing the temporary files a
     * killed writer left there).
     *
     * @param directory the study directory
     * @return what was written
     * @throws BadInputException for a missing or invalid study directory (naming the file and the field)
     * @throws IOException when a file cannot be read or written
     */
    public static Outcome write(Path directory) throws IOException {
        return write(directory, VerdictOptions.defaults());
    }

    /** As {@link #write(Path)} with the given verdict settings. */
    public static Outcome write(Path directory, VerdictOptions options) throws IOException {
        Study study = StudyReader.read(directory);
        AtomicFile.removeLeftovers(directory);
        StudyAnalysis analysis = StudyAnalysis.of(study, options);
        Path summary = directory.resolve(StudyFormat.SUMMARY);
        Path report = directory.resolve(StudyFormat.REPORT);
        AtomicFile.write(summary, SummaryTable.render(analysis));
        ReportPage.Rendered page = ReportPage.renderPage(analysis);
        AtomicFile.write(report, page.html());
        return new Outcome(report, summary, study.armCount() * study.replicateCount(), study.missing(),
                study.diverged(), page.failedSections(), analysis.verdict());
    }
}

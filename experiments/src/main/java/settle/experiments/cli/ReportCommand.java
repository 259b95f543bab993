package settle.experiments.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import settle.reports.Report;

/**
 * {@code settle report STUDY_DIR}: (re)builds {@code report.html} and {@code summary.csv} from a study
 * directory. Exit 0; 3 when replicates are missing (a partial study still gets its report) or diverged; 2 for a
 * missing or invalid study directory or file (naming the file and the field), or one in an older format; 1 when a
 * file cannot be read or written, or the report could not be drawn whole (a fault in settle; one line says what, and
 * the sections drawn are written). The mapping is {@link Failures}'.
 */
@Command(name = "report", mixinStandardHelpOptions = true,
        description = "(Re)build report.html and summary.csv from a study directory.")
public final class ReportCommand implements Callable<Integer> {

    @Parameters(index = "0", paramLabel = "STUDY_DIR", description = "the study directory")
    Path directory;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() throws IOException {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        Report.Outcome outcome = Report.write(directory);
        RunCommand.printVerdict(out, outcome);
        out.println("summary: " + outcome.summary().toAbsolutePath().normalize());
        if (outcome.partial()) {
            err.println("settle report: partial study: " + outcome.missing() + " of " + outcome.replicates()
                    + " replicates missing");
        }
        if (outcome.diverged() > 0) {
            err.println("settle report: " + outcome.diverged() + " of " + outcome.replicates() + " replicates diverged");
        }
        if (!outcome.failedSections().isEmpty()) {
            err.println("settle report: the report was written, but these sections could not be drawn: "
                    + String.join("; ", outcome.failedSections()) + " (a fault in settle: each says so in its place)");
            return Main.FAILED;
        }
        return outcome.partial() || outcome.diverged() > 0 ? Main.INCOMPLETE : Main.OK;
    }
}

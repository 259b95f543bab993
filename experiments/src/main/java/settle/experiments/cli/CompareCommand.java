package settle.experiments.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import settle.input.BadInputException;
import settle.reports.Compare;

/**
 * {@code settle compare DIR… [--html FILE] [--csv FILE]}: several studies side by side, arms matched by name, each
 * arm's primary effect against its own study's baseline (nothing pooled), on one page and in one CSV
 * ({@link Compare}). Without options they go to {@code studies/compare.html} and {@code studies/compare.csv}
 * ({@link Places}); with {@code --html} alone the CSV goes beside the page. Exit 0; 3 when a study is partial or has
 * diverged replicates (its verdict is shown as it stands); 2 for bad input (fewer than two studies, one given twice,
 * a missing or invalid study directory, one in another format), nothing written; 1 when a file cannot be read or
 * written.
 */
@Command(name = "compare", mixinStandardHelpOptions = true,
        description = "Set studies side by side: each arm's effect against its own study's baseline, matched by name.")
public final class CompareCommand implements Callable<Integer> {

    @Parameters(arity = "0..*", paramLabel = "STUDY_DIR", description = "two or more study directories")
    List<Path> directories = List.of();

    @Option(names = "--html", paramLabel = "FILE", description = "the page (default: studies/compare.html)")
    Path html;

    @Option(names = "--csv", paramLabel = "FILE",
            description = "the table (default: beside the page, compare.html giving compare.csv)")
    Path csv;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() throws IOException {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        Path page = html != null ? html : Places.COMPARISON;
        Path table = csv != null ? csv : Places.besidePage(page);
        refuseDirectory("--html", page);
        refuseDirectory("--csv", table);
        if (page.toAbsolutePath().normalize().equals(table.toAbsolutePath().normalize())) {
            throw BadInputException.of("--csv", "--csv " + BadInputException.shown(table.toString()) + " is the page's"
                    + " own file; give the table another name");
        }
        Compare.Outcome outcome = Compare.write(directories, page, table);
        for (String line : outcome.lines()) {
            out.println(line);
        }
        out.println("page: " + outcome.page().toAbsolutePath().normalize());
        out.println("table: " + outcome.table().toAbsolutePath().normalize());
        List<String> incomplete = outcome.incomplete();
        for (String line : incomplete) {
            err.println("settle compare: " + line);
        }
        return incomplete.isEmpty() ? Main.OK : Main.INCOMPLETE;
    }

    private static void refuseDirectory(String option, Path file) {
        if (Files.isDirectory(file)) {
            throw BadInputException.of(option, option + " " + BadInputException.shown(file.toString()) + " is a"
                    + " directory; expected the file to write");
        }
    }
}

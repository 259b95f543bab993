package settle.experiments.cli;

import java.io.PrintWriter;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Spec;
import settle.datasets.Dataset;
import settle.datasets.bundled.BundledData;
import settle.datasets.bundled.BundledDataset;
import settle.datasets.table.SourceTable;

/** {@code settle datasets}: the bundled datasets with their provenance, each checked against its SHA-256. */
@Command(name = "datasets", mixinStandardHelpOptions = true,
        description = "List the bundled datasets (use them as bundled:NAME) with rows, features, classes, "
                + "source, licence and citation.")
public final class DatasetsCommand implements Callable<Integer> {

    @Spec
    private CommandSpec spec;

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        out.println("Bundled datasets: use them as --data bundled:NAME or data.source: bundled:NAME.");
        out.println("Each comes from the " + BundledData.REPOSITORY + ",");
        out.println("licensed CC BY 4.0: credit UCI and the original creators named below when you publish results.");
        for (BundledDataset d : BundledData.all()) {
            out.println();
            out.println(d.name() + "  " + d.title());
            int classes;
            if (d.table()) {
                SourceTable table = BundledData.readTable(d.name(), null);
                int missing = 0;
                for (int c = 0; c < table.columnNames().size(); c++) {
                    missing += c == table.labelColumn() ? 0 : table.missingCells(c);
                }
                classes = table.classNames().size();
                out.println("  rows      " + table.rows() + ", input columns " + (table.columnNames().size() - 1)
                        + " (" + missing + " missing cells; a table: the data.* column keys apply), label column '"
                        + d.labelColumn() + "'");
            } else {
                Dataset loaded = BundledData.load(d.name(), null);
                classes = loaded.classes();
                out.println("  rows      " + loaded.rows() + ", features " + loaded.features() + ", label column '"
                        + d.labelColumn() + "'");
            }
            out.println("  classes   " + classes + ": " + d.classSummary()
                    + (classes == 2 ? " (class 1, the positive class: " + d.classNames().get(1) + ")" : ""));
            out.println("  source    " + d.source());
            out.println("  licence   " + d.licence());
            out.println("  creators  " + d.credit());
            out.println("  citation  " + d.citation());
            out.println("  sha256    " + d.sha256() + " (verified)");
        }
        out.flush();
        return Main.OK;
    }
}

package settle.cluster;

import java.io.Serializable;
import java.nio.file.Path;
import java.util.List;
import settle.datasets.Dataset;
import settle.datasets.PreparedData;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.PlanData;
import settle.experiments.plan.PlanParser;
import settle.experiments.plan.PlanWriter;
import settle.experiments.study.StudyContext;

/**
 * What the driver broadcasts to every executor once per run: the resolved plan (its canonical YAML text and
 * hash), every kept row of its data as the driver read and encoded it, and which of those rows form each split.
 * An executor never reads the data source nor splits it again: it builds the splits from the shipped rows and parts
 * with {@link PlanData#of} and its {@link StudyContext} from them, once per deserialised broadcast value, that is once per executor JVM
 * while Spark keeps the value in memory. Building it is deterministic, so every executor trains the same
 * bytes the driver would.
 */
final class StudyShipment implements Serializable {

    private static final long serialVersionUID = 1L;

    private final String planYaml;
    private final String planFile;
    private final String planSha256;
    private final String dataName;
    private final double[] features;
    private final int[] labels;
    private final String[] featureNames;
    private final String[] classNames;
    private final int[] trainRows;
    private final int[] holdoutRows;
    private final int[] testRows;

    /** Built on first use in each JVM that holds this value; never shipped. */
    private transient StudyContext context;

    /** @param context the study on the driver; not modified */
    StudyShipment(StudyContext context) {
        this.planYaml = PlanWriter.toYaml(context.plan());
        this.planFile = context.parsed().file();
        this.planSha256 = PlanWriter.sha256(context.plan());
        Dataset all = context.data().all();
        this.dataName = all.name();
        this.features = all.featureMatrix();
        this.labels = all.labels();
        this.featureNames = all.featureNames().toArray(new String[0]);
        this.classNames = all.classNames().toArray(new String[0]);
        PreparedData parts = context.data().prepared();
        this.trainRows = parts.train();
        this.holdoutRows = parts.holdout();
        this.testRows = parts.test();
    }

    /** @return the study's name, for the application name */
    String study() {
        return PlanParser.read(planYaml, planFile, Path.of("")).plan().study();
    }

    /**
     * @return the context rebuilt from the shipped plan and rows, built once per JVM that holds this value
     * @throws IllegalStateException when the plan does not read back to the driver's (a defect, never input)
     */
    synchronized StudyContext context() {
        if (context == null) {
            // the resolved plan names every path absolutely, so the base directory is never consulted
            ParsedPlan parsed = PlanParser.read(planYaml, planFile, Path.of(""));
            String readBack = PlanWriter.sha256(parsed.plan());
            if (!readBack.equals(planSha256)) {
                throw new IllegalStateException(planFile + ": the resolved plan read back on an executor hashes to "
                        + readBack + ", not the driver's " + planSha256);
            }
            Dataset all = new Dataset(dataName, features, labels, List.of(featureNames), List.of(classNames));
            context = StudyContext.build(parsed, PlanData.of(parsed, new PreparedData(all, trainRows, holdoutRows,
                    testRows, null, List.of())));
        }
        return context;
    }
}

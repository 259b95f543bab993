package settle.reports.format;

import java.util.List;

/**
 * {@code manifest.json}: a study's provenance and each replicate's status (README, "Study directory"). What the runner
 * writes through {@link ManifestJson#write} and the report reads through {@link ManifestJson#read}.
 *
 * @param format the study directory format ({@link StudyFormat#VERSION})
 * @param study the study's name (the plan's {@code study})
 * @param tool settle's name, version and the commit it was built from
 * @param runtime the JVM that ran the study
 * @param processor the CPU it ran on
 * @param executor where the replicates ran
 * @param threads replicates trained at once
 * @param command the command line as typed
 * @param generator the named random generator algorithm
 * @param rootSeed the plan's root seed
 * @param started when the run started (ISO-8601)
 * @param endedAt when it ended, or null while running
 * @param planSha256 SHA-256 of the resolved plan
 * @param dataSha256 SHA-256 of the data
 * @param splitSha256 SHA-256 of the train/test/holdout split
 * @param settingsSha256 SHA-256 of the shared settings (seed, data and its encoding, model, training: the plan but
 *     its study name, replicate count, baseline and arms); a study grows only while it is unchanged
 * @param data the data's source, size, names and splits
 * @param standardisation the z-score fitted on the training split, or null without one
 * @param model the model in words
 * @param parameters the number of parameters P
 * @param l2 the model's penalty λ (the plan's {@code model.l2}; 0 for none)
 * @param training the training settings every replicate ran with (the resolved plan's {@code training} keys)
 * @param reference "reference.json", or why there is none
 * @param baseline the baseline arm's name
 * @param arms the arms' names, in arm-index order (index 1 first)
 * @param armIds the arms' ids ({@link StudyFormat#armId}), in the same order: arm i's replicate files are in
 *     {@code arms/<armIds[i]>}
 * @param grids what each grid entry of the plan expanded into, in the plan's order; empty without a grid
 * @param statuses each replicate's status, arm by arm, replicate by replicate
 */
public record Manifest(int format, String study, Tool tool, Jvm runtime, Cpu processor, String executor,
        int threads, List<String> command, String generator, long rootSeed, String started, String endedAt,
        String planSha256, String dataSha256, String splitSha256, String settingsSha256, Data data,
        Standardisation standardisation, String model, int parameters, double l2, Training training, String reference,
        String baseline,
        List<String> arms, List<String> armIds, List<Grid> grids, List<Status> statuses) {

    /** The status of a replicate still to train while the run goes on. */
    public static final String PENDING = "pending";
    /** The status of a replicate that has no file after the run. */
    public static final String MISSING = "missing";

    public Manifest {
        command = List.copyOf(command);
        arms = List.copyOf(arms);
        armIds = List.copyOf(armIds);
        if (armIds.size() != arms.size()) {
            throw new IllegalArgumentException(armIds.size() + " arm ids for " + arms.size() + " arms");
        }
        grids = List.copyOf(grids);
        statuses = List.copyOf(statuses);
        java.util.Objects.requireNonNull(training, "training");
    }

    /**
     * The training settings shared by every replicate, as the runner used them: the resolved plan's {@code training}
     * keys, every default filled in. The budget of one replicate is {@code epochs} × {@link Data#updatesPerEpoch}
     * updates.
     *
     * @param epochs passes over the training split, ≥ 1
     * @param batch rows per mini-batch B, ≥ 1
     * @param sampling how an epoch's batches are drawn: one of {@link #SAMPLINGS}
     * @param momentum heavy-ball β in [0, 1); 0 is plain SGD
     * @param tail τ in (0, 1]: the tail is the last ⌈τT⌉ updates
     * @param snapshots the tail snapshots K asked for, ≥ 1
     */
    public record Training(int epochs, int batch, String sampling, double momentum, double tail, int snapshots) {

        /** The samplings the manifest records, as a plan writes them. */
        public static final List<String> SAMPLINGS = List.of("shuffle", "replacement");

        public Training {
            if (epochs < 1 || batch < 1 || snapshots < 1 || !SAMPLINGS.contains(sampling)
                    || !(momentum >= 0 && momentum < 1) || !(tail > 0 && tail <= 1)) {
                throw new IllegalArgumentException("training settings out of range: " + epochs + ", " + batch + ", "
                        + sampling + ", " + momentum + ", " + tail + ", " + snapshots);
            }
        }

        /** @return T, the planned updates of one replicate for {@code updatesPerEpoch} updates in an epoch */
        public long updates(int updatesPerEpoch) {
            return (long) epochs * updatesPerEpoch;
        }
    }

    /**
     * @param name "settle"
     * @param version settle's version
     * @param gitCommit the commit settle was built from ("unknown" when it cannot be told)
     */
    public record Tool(String name, String version, String gitCommit) {
    }

    /**
     * @param vendor the JVM's vendor
     * @param name its name
     * @param version its version
     */
    public record Jvm(String vendor, String name, String version) {
    }

    /**
     * @param model the CPU model
     * @param arch the architecture
     * @param cores the cores available
     */
    public record Cpu(String model, String arch, int cores) {
    }

    /**
     * @param source the plan's data source
     * @param rows rows of the data
     * @param features its features
     * @param featureNames the feature names
     * @param classNames the class names, in class order
     * @param trainRows training rows
     * @param testRows test rows
     * @param holdoutRows holdout rows (0 without a holdout split)
     * @param updatesPerEpoch updates in one epoch
     */
    public record Data(String source, int rows, int features, List<String> featureNames, List<String> classNames,
            int trainRows, int testRows, int holdoutRows, int updatesPerEpoch) {
        public Data {
            featureNames = List.copyOf(featureNames);
            classNames = List.copyOf(classNames);
        }
    }

    /**
     * @param means the training split's feature means
     * @param scales its feature scales (population standard deviations; 1 for a constant column)
     */
    public record Standardisation(double[] means, double[] scales) {
    }

    /**
     * @param arm the arm's index, from 1
     * @param replicate the replicate, from 1
     * @param status finished, diverged, pending (running) or missing (after the run)
     */
    public record Status(int arm, int replicate, String status) {
    }

    /** @return settle's version that ran the study */
    public String toolVersion() {
        return tool.version();
    }

    /** @return the commit settle was built from */
    public String gitCommit() {
        return tool.gitCommit();
    }

    /** @return the JVM vendor, name and version in one line */
    public String jvm() {
        return join(runtime.vendor(), runtime.name(), runtime.version());
    }

    /** @return the CPU model, architecture and core count in one line */
    public String cpu() {
        return join(processor.model(), processor.arch(), processor.cores() + " cores");
    }

    /** @return when the run ended, or "" while running or when it was killed */
    public String ended() {
        return endedAt == null ? "" : endedAt;
    }

    /** @return the plan's data source */
    public String dataSource() {
        return data.source();
    }

    /** @return rows of the data */
    public int rows() {
        return data.rows();
    }

    /** @return the feature names */
    public List<String> featureNames() {
        return data.featureNames();
    }

    /** @return the class names, in class order */
    public List<String> classNames() {
        return data.classNames();
    }

    /** @return training rows */
    public int trainRows() {
        return data.trainRows();
    }

    /** @return test rows */
    public int testRows() {
        return data.testRows();
    }

    /** @return updates in one epoch */
    public int updatesPerEpoch() {
        return data.updatesPerEpoch();
    }

    /** @return T, the planned updates of one replicate: epochs × updates per epoch */
    public long plannedUpdates() {
        return training.updates(data.updatesPerEpoch());
    }

    /** @return replicates per arm */
    public int replicates() {
        return statuses.size() / arms.size();
    }

    /** @return the 0-based index of the baseline arm */
    public int baselineIndex() {
        return arms.indexOf(baseline);
    }

    /** @return the number of classes K */
    public int classes() {
        return data.classNames().size();
    }

    private static String join(String... parts) {
        StringBuilder b = new StringBuilder();
        for (String p : parts) {
            if (!p.isEmpty()) {
                b.append(b.length() == 0 ? "" : ", ").append(p);
            }
        }
        return b.toString();
    }
}

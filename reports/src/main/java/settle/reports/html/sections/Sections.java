package settle.reports.html.sections;

import java.util.List;

/** The report's sections in page order. */
public final class Sections {

    private static final List<Section> IN_ORDER = List.of(new VerdictSection(), new ClassBalanceSection(), new RatesSection(),
            new ObjectiveSection(), new DistanceSection(), new WanderSection(), new AprioriSection(),
            new TailCloudSection(), new GridSection(), new CoefficientsSection(), new ReplicatesSection(), new ProvenanceSection(),
            new LimitsSection());

    private Sections() {
    }

    /** @return every section, in the order the page shows them */
    public static List<Section> inOrder() {
        return IN_ORDER;
    }
}

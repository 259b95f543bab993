package settle.reports.html.sections;

/**
 * One section of {@code report.html}: a {@code <section>} element with an id and a heading, whose content draws
 * from the analysed study. The page ({@link settle.reports.html.ReportPage}) writes the element and its heading,
 * calls {@link #draw}, and replaces the section by a notice when it throws.
 */
public sealed interface Section permits VerdictSection, ClassBalanceSection, RatesSection, ObjectiveSection,
        DistanceSection, WanderSection, AprioriSection, TailCloudSection, GridSection, CoefficientsSection,
        ReplicatesSection, ProvenanceSection, LimitsSection {

    /** @return the section element's id, also the navigation's anchor; stable across versions */
    String id();

    /** @return the section's short title in the page's navigation (and in the notice that replaces it) */
    String navigation();

    /** @return the section's heading */
    String heading();

    /**
     * Draws the section's content, after its heading.
     *
     * @param d the page being drawn
     */
    void draw(Drawing d);
}

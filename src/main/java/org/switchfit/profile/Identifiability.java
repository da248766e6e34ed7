package org.switchfit.profile;

/**
 * Classification of a profile after Raue et al. 2009 (Bioinformatics 25(15):1923-1929,
 * doi:10.1093/bioinformatics/btp358).
 */
public enum Identifiability {
    /** The pointwise confidence interval is closed on both sides. */
    IDENTIFIABLE,
    /** The profile rises but the pointwise interval is open on one or both sides. */
    PRACTICALLY_NONIDENTIFIABLE,
    /**
     * The profile is flat (within the flatness tolerance) over everything explored: other parameters compensate
     * exactly, see {@link Profile#compensations()}.
     */
    STRUCTURALLY_NONIDENTIFIABLE
}

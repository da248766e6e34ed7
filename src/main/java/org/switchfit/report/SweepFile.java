package org.switchfit.report;

import com.fasterxml.jackson.annotation.JsonProperty;
import java.util.List;

/**
 * Content of {@code sweep.json}, written by {@code switchfit sweep}: simulated slow ramps of a control parameter
 * up and down, the response along each, and where the response jumped. Immutable.
 *
 * @param parameter control parameter id
 * @param readout   id of the state or observable followed
 * @param rate      ramp rate, control units per time unit
 * @param runs      the ramps (usually one up, one down)
 */
public record SweepFile(String parameter, String readout, double rate, List<Run> runs) {

    /** Copies the list. */
    public SweepFile {
        runs = runs == null ? List.of() : List.copyOf(runs);
    }

    /** Ramp direction. */
    public enum Direction {
        /** Increasing control parameter. */
        @JsonProperty("up") UP,
        /** Decreasing control parameter. */
        @JsonProperty("down") DOWN
    }

    /**
     * One ramp.
     *
     * @param direction up or down
     * @param values    control parameter along the ramp, in ramp order
     * @param response  readout at each value
     * @param jumps     jumps found along the ramp
     */
    public record Run(Direction direction, double[] values, double[] response, List<Jump> jumps) {
        /** Validates and copies. */
        public Run {
            values = FileArrays.copy(values, "values");
            response = FileArrays.copy(response, "response");
            FileArrays.sameLength(values.length, response, "response");
            jumps = jumps == null ? List.of() : List.copyOf(jumps);
        }

        @Override
        public double[] values() {
            return values.clone();
        }

        @Override
        public double[] response() {
            return response.clone();
        }
    }

    /**
     * A jump of the readout.
     *
     * @param value  control parameter value at the jump
     * @param before readout just before
     * @param after  readout just after
     */
    public record Jump(double value, double before, double after) {
    }
}

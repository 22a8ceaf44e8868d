package wayward.analysis;

/**
 * What one camera's stages cost since counting began (all 0 before): CPU nanoseconds of each stage, frames
 * decoded and analysed, and the stream seconds they covered.
 */
public record StageFigures(double decodeNanos, double shrinkNanos, double flowNanos, double zonesNanos,
        long decodedFrames, long analysedFrames, double streamSeconds) {

    /** CPU nanoseconds of all stages together. */
    public double totalNanos() {
        return decodeNanos + shrinkNanos + flowNanos + zonesNanos;
    }
}

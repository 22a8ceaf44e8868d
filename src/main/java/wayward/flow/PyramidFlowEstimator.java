package wayward.flow;

/**
 * What both Lucas–Kanade estimators share: the two pyramids (earlier and later frame), the frame hand-over of
 * {@link #push} (each frame's pyramid is built once and becomes the next pair's earlier one), and the checks at
 * the entry. Subclasses size the pyramids in their constructor and say how to build one and how to estimate.
 */
abstract class PyramidFlowEstimator implements FlowEstimator {
    final int width;
    final int height;
    private final int stride;
    float[][] earlier;
    float[][] later;
    private boolean hasEarlier;
    /** A still frame kept as it came ({@link #pushStill}); its pyramid becomes {@link #earlier} when needed. */
    private final byte[] stillFrame;
    private boolean earlierIsStill;

    PyramidFlowEstimator(int width, int height, int stride) {
        if (width < 1 || height < 1) {
            throw new IllegalArgumentException("size: " + width + "x" + height + " (expected at least 1x1)");
        }
        this.width = width;
        this.height = height;
        this.stride = stride;
        this.stillFrame = new byte[width * height];
    }

    /** Fills every level of {@code pyramid} from a frame. */
    abstract void buildPyramid(byte[] frame, float[][] pyramid);

    /** The flow from {@link #earlier} to {@link #later} into {@code out}. */
    abstract void estimate(FlowField out);

    @Override
    public final FlowField newField() {
        return new FlowField(width, height, stride);
    }

    /**
     * Flow from {@code first} to {@code second}, both gray 8-bit frames of this estimator's size (row-major,
     * stride = width). Writes {@code out}; allocates nothing. Forgets any frame given to {@link #push}.
     */
    @Override
    public final void compute(byte[] first, byte[] second, FlowField out) {
        checkFrame(first, "first");
        checkFrame(second, "second");
        checkField(out);
        buildPyramid(first, earlier);
        buildPyramid(second, later);
        estimate(out);
        hasEarlier = false;
        earlierIsStill = false;
    }

    /**
     * Feeds the next frame of a stream. From the second call on, writes the flow from the previous frame to
     * this one into {@code out} and returns true; the first call only stores the frame and returns false.
     * Allocates nothing.
     */
    @Override
    public final boolean push(byte[] frame, FlowField out) {
        checkFrame(frame, "frame");
        checkField(out);
        buildPyramid(frame, later);
        if (hasEarlier && earlierIsStill) {
            buildPyramid(stillFrame, earlier);
        }
        earlierIsStill = false;
        boolean estimated = false;
        if (hasEarlier) {
            estimate(out);
            estimated = true;
        }
        float[][] t = earlier;
        earlier = later;
        later = t;
        hasEarlier = true;
        return estimated;
    }

    @Override
    public final void pushStill(byte[] frame, FlowField out) {
        checkFrame(frame, "frame");
        checkField(out);
        System.arraycopy(frame, 0, stillFrame, 0, stillFrame.length);
        earlierIsStill = true;
        hasEarlier = true;
        java.util.Arrays.fill(out.u, 0f);
        java.util.Arrays.fill(out.v, 0f);
        out.globalU = 0f;
        out.globalV = 0f;
    }

    /** Drops the stored frame, e.g. after a gap in the stream; the next {@link #push} starts afresh. */
    @Override
    public final void reset() {
        hasEarlier = false;
        earlierIsStill = false;
    }

    private void checkFrame(byte[] frame, String name) {
        if (frame.length != width * height) {
            throw new IllegalArgumentException(name + ": " + frame.length + " pixels (expected "
                    + width + "x" + height + " = " + width * height + ")");
        }
    }

    private void checkField(FlowField out) {
        if (out.imageWidth != width || out.imageHeight != height || out.stride != stride) {
            throw new IllegalArgumentException("out: " + out.imageWidth + "x" + out.imageHeight + " every "
                    + out.stride + " px (expected " + width + "x" + height + " every " + stride + " px)");
        }
    }
}

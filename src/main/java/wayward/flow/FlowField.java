package wayward.flow;

/**
 * A dense flow field: per pixel the displacement from the earlier to the later frame, in pixels of this
 * field's resolution per frame pair, and a confidence. Row-major arrays, stride = width, owned by this field
 * and overwritten by every estimate.
 */
public final class FlowField {
    public final int width;
    public final int height;
    /** Horizontal displacement, pixels (positive = right). */
    public final float[] u;
    /** Vertical displacement, pixels (positive = down, image rows). */
    public final float[] v;
    /**
     * Smallest eigenvalue of the window's mean structure tensor (Shi &amp; Tomasi 1994), in
     * (grey levels per pixel)²: near 0 on flat areas and on straight edges, where the flow is not defined.
     */
    public final float[] confidence;

    public FlowField(int width, int height) {
        if (width < 1 || height < 1) {
            throw new IllegalArgumentException("size: " + width + "x" + height + " (expected at least 1x1)");
        }
        this.width = width;
        this.height = height;
        this.u = new float[width * height];
        this.v = new float[width * height];
        this.confidence = new float[width * height];
    }
}

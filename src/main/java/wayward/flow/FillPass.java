package wayward.flow;

/**
 * What one fill pass of {@link GridLucasKanadeFlow} reads and writes on one level: the current motion and support,
 * the next ones, which points keep their own motion and the neighbours' brightness weights. Set before each pass
 * (the current and next arrays swap after it) and only read during it, by every band alike.
 */
final class FillPass {
    /** Grid columns of the level. */
    int gridWidth;
    /** Whether this is the full-size level, where kept points average only with neighbours that move alike. */
    boolean full;
    float[] u;
    float[] v;
    float[] nextU;
    float[] nextV;
    /** Current support tensor per point. */
    float[] a;
    float[] b;
    float[] c;
    /** Next support tensor per point. */
    float[] nextA;
    float[] nextB;
    float[] nextC;
    /** 1 where a point keeps its own motion, else 0. */
    float[] kept;
    /** Neighbour n of point k's brightness weight at {@code n × weightStride + k}. */
    float[] weight;
    int weightStride;
}

package wayward.http;

import io.netty.handler.codec.http.QueryStringDecoder;
import wayward.analysis.ZoneConfig;

/**
 * The query of {@code /api/measure}: a zone drawn on the live view (polygon=x,y;x,y;… as fractions of the
 * picture, 3 to 64 points), an optional heading (degrees, 0 up to 360) and its tolerance (0 to 90).
 *
 * @param camera      the camera's id
 * @param xs          the polygon's x fractions
 * @param ys          its y fractions
 * @param headingDeg  NaN: none
 * @param toleranceDeg the heading's tolerance
 */
record MeasureRequest(String camera, double[] xs, double[] ys, double headingDeg, double toleranceDeg) {
    /** What a refused query is told. */
    static final String USAGE = "polygon=x,y;x,y;x,y (fractions), heading=deg, tolerance=deg";

    /** Parses a query; IllegalArgumentException (or NumberFormatException) says what is wrong. */
    static MeasureRequest parse(QueryStringDecoder q) {
        String[] points = Replies.first(q, "polygon", "").split(";");
        if (points.length < 3 || points.length > 64) {
            throw new IllegalArgumentException("3 to 64 points");
        }
        double[] xs = new double[points.length];
        double[] ys = new double[points.length];
        for (int i = 0; i < points.length; i++) {
            String[] xy = points[i].split(",");
            xs[i] = Double.parseDouble(xy[0]);
            ys[i] = Double.parseDouble(xy[1]);
            if (xy.length != 2 || !(xs[i] >= 0 && xs[i] <= 1 && ys[i] >= 0 && ys[i] <= 1)) {
                throw new IllegalArgumentException("points x,y from 0 to 1");
            }
        }
        String h = Replies.first(q, "heading", "");
        double heading = h.isEmpty() ? Double.NaN : Double.parseDouble(h);
        if (!Double.isNaN(heading) && !(heading >= 0 && heading < 360)) {
            throw new IllegalArgumentException("heading from 0 up to 360");
        }
        double tolerance = Double.parseDouble(
                Replies.first(q, "tolerance", Double.toString(ZoneConfig.DEFAULT_TOLERANCE_DEG)));
        if (!(tolerance >= 0 && tolerance <= 90)) {
            throw new IllegalArgumentException("tolerance from 0 to 90");
        }
        return new MeasureRequest(Replies.first(q, "camera", ""), xs, ys, heading, tolerance);
    }
}

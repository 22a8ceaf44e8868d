package wayward.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.BasicStroke;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.util.List;
import org.jfree.chart.ChartRenderingInfo;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.plot.XYPlot;
import org.junit.jupiter.api.Test;
import wayward.analysis.CameraConfig;
import wayward.analysis.ZoneConfig;
import wayward.rule.RuleSettings;
import wayward.zone.ZoneReading;

/**
 * The report plot keeps the against_share series readable where it lies on the moving_share series (all of the
 * zone's motion going against the heading): the pixels there are the against colour, not the moving colour or a
 * blend, and the legend names both series with their own strokes. Positions come from JFreeChart's own axis
 * mapping of the rendered chart.
 */
class ReportPlotTest {
    private static final String CAMERA = "cam";
    private static final String ZONE = "lane";

    private static JFreeChart plotOfOverlap() {
        ZoneConfig zone = new ZoneConfig(ZONE, new double[] {0, 1, 1, 0}, new double[] {0, 0, 1, 1}, Double.NaN,
                60, 8, 8, new RuleSettings(0.05, 0.02, 0.5, 1.0, 2.0), 0);
        CameraConfig camera = new CameraConfig(CAMERA, "file.mp4", false, 320, 10, false, null, List.of(zone), false);
        ReplayReport report = new ReplayReport();
        ZoneReading r = new ZoneReading();
        for (int k = 0; k <= 60; k++) {
            r.streamSeconds = k / 10.0;
            boolean overlap = r.streamSeconds >= 2 && r.streamSeconds <= 4;
            r.movingShare = overlap ? 0.5 : 0.2;
            r.againstShare = overlap ? 0.5 : 0;
            report.reading(camera, 0, r, null, "idle");
        }
        return report.chart(CAMERA, ZONE);
    }

    private static boolean red(int rgb) {
        int r = (rgb >> 16) & 0xff;
        int g = (rgb >> 8) & 0xff;
        int b = rgb & 0xff;
        return r > 180 && g < 90 && b < 90;
    }

    private static boolean blue(int rgb) {
        int r = (rgb >> 16) & 0xff;
        int b = rgb & 0xff;
        return b > 180 && r < 90;
    }

    /** Pixels of one kind in the column at stream time t, within 6 px of the value's row. */
    private static int[] countNear(BufferedImage img, XYPlot plot, Rectangle2D area, double t, double value) {
        int x = (int) Math.round(plot.getDomainAxis().valueToJava2D(t, area, plot.getDomainAxisEdge()));
        int y = (int) Math.round(plot.getRangeAxis().valueToJava2D(value, area, plot.getRangeAxisEdge()));
        int reds = 0;
        int blues = 0;
        for (int dx = -3; dx <= 3; dx++) {
            for (int dy = -6; dy <= 6; dy++) {
                int rgb = img.getRGB(x + dx, y + dy);
                reds += red(rgb) ? 1 : 0;
                blues += blue(rgb) ? 1 : 0;
            }
        }
        return new int[] {reds, blues};
    }

    @Test
    void againstShareStaysVisibleWhereItOverlapsMovingShare() {
        JFreeChart chart = plotOfOverlap();
        ChartRenderingInfo info = new ChartRenderingInfo();
        BufferedImage img = chart.createBufferedImage(1200, 420, info);
        Rectangle2D area = info.getPlotInfo().getDataArea();
        XYPlot plot = chart.getXYPlot();

        int[] overlap = countNear(img, plot, area, 3.0, 0.5);
        assertTrue(overlap[0] >= 7, "against colour where both series are 0.5: " + overlap[0] + " px");
        assertEquals(0, overlap[1], "moving colour showing through where both are 0.5");
        int[] movingOnly = countNear(img, plot, area, 5.0, 0.2);
        assertTrue(movingOnly[1] > 0 && movingOnly[0] == 0, "moving alone at 0.2: blue " + movingOnly[1]
                + ", red " + movingOnly[0]);

        LegendItemCollection legend = plot.getLegendItems();
        assertEquals("moving_share: moving at all", legend.get(0).getLabel());
        assertTrue(legend.get(1).getLabel().startsWith("against_share: "), legend.get(1).getLabel());
        float movingWidth = ((BasicStroke) legend.get(0).getLineStroke()).getLineWidth();
        float againstWidth = ((BasicStroke) legend.get(1).getLineStroke()).getLineWidth();
        assertTrue(againstWidth > movingWidth, "legend strokes: against " + againstWidth + ", moving " + movingWidth);
        assertEquals(ReplayReport.AGAINST_RED, legend.get(1).getLinePaint());
    }
}

package wayward.http;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.netty.handler.codec.http.QueryStringDecoder;
import java.nio.charset.StandardCharsets;
import org.junit.jupiter.api.Test;
import wayward.analysis.ZoneConfig;

class MeasureRequestTest {
    private static MeasureRequest parse(String query) {
        // as the router decodes it: ";" belongs to the value
        return MeasureRequest.parse(new QueryStringDecoder("/api/measure?" + query, StandardCharsets.UTF_8, true,
                1024, true));
    }

    @Test
    void aDrawnZoneWithAndWithoutHeading() {
        MeasureRequest m = parse("camera=dock&polygon=0.1,0.2;0.9,0.2;0.5,0.8&heading=270&tolerance=45");
        assertEquals("dock", m.camera());
        assertArrayEquals(new double[] {0.1, 0.9, 0.5}, m.xs());
        assertArrayEquals(new double[] {0.2, 0.2, 0.8}, m.ys());
        assertEquals(270, m.headingDeg());
        assertEquals(45, m.toleranceDeg());
        MeasureRequest plain = parse("camera=dock&polygon=0,0;1,0;1,1");
        assertTrue(Double.isNaN(plain.headingDeg()));
        assertEquals(ZoneConfig.DEFAULT_TOLERANCE_DEG, plain.toleranceDeg());
    }

    @Test
    void refusalsSayWhatIsWrong() {
        assertEquals("3 to 64 points", assertThrows(IllegalArgumentException.class,
                () -> parse("polygon=0,0;1,1")).getMessage());
        assertEquals("points x,y from 0 to 1", assertThrows(IllegalArgumentException.class,
                () -> parse("polygon=0,0;1.5,0;1,1")).getMessage());
        assertEquals("points x,y from 0 to 1", assertThrows(IllegalArgumentException.class,
                () -> parse("polygon=0,0,0;1,0;1,1")).getMessage());
        assertEquals("heading from 0 up to 360", assertThrows(IllegalArgumentException.class,
                () -> parse("polygon=0,0;1,0;1,1&heading=360")).getMessage());
        assertEquals("tolerance from 0 to 90", assertThrows(IllegalArgumentException.class,
                () -> parse("polygon=0,0;1,0;1,1&tolerance=91")).getMessage());
        assertThrows(NumberFormatException.class, () -> parse("polygon=0,0;1,x;1,1"));
        assertThrows(IllegalArgumentException.class, () -> parse("polygon=" + "0,0;".repeat(65)));
    }
}

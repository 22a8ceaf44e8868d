package wayward.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;

import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;

/** The evidence sidecar is one JSON document holding both phases' records, not two JSON lines. */
class EvidenceSidecarTest {
    @Test
    void theSidecarIsOneJsonDocumentWithTheStartAndEndRecords() throws Exception {
        String start = "{\"id\":\"e1\",\"phase\":\"start\",\"stream_s\":12.3}";
        String end = "{\"id\":\"e1\",\"phase\":\"end\",\"stream_s\":15.8}";
        // read whole by Jackson with trailing content refused: two JSON texts in a row would fail here (RFC 8259 §2)
        ObjectMapper json = new ObjectMapper().enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS);
        JsonNode doc = json.readTree(EvidenceKeeper.sidecar(start, end));
        assertEquals(2, doc.size());
        assertEquals(json.readTree(start), doc.get("start"));
        assertEquals(json.readTree(end), doc.get("end"));
    }
}

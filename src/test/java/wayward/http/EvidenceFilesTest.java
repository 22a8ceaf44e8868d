package wayward.http;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import org.junit.jupiter.api.Test;

class EvidenceFilesTest {
    @Test
    void oneRangeOfBytesAsRfc9110DefinesIt() {
        // RFC 9110 §14.1.2's examples on a 10000-byte representation
        assertEquals(new EvidenceFiles.Range(0, 499), EvidenceFiles.parseRange("bytes=0-499", 10_000));
        assertEquals(new EvidenceFiles.Range(500, 999), EvidenceFiles.parseRange("bytes=500-999", 10_000));
        assertEquals(new EvidenceFiles.Range(9500, 9999), EvidenceFiles.parseRange("bytes=-500", 10_000));
        assertEquals(new EvidenceFiles.Range(9500, 9999), EvidenceFiles.parseRange("bytes=9500-", 10_000));
        assertEquals(new EvidenceFiles.Range(0, 0), EvidenceFiles.parseRange("bytes=0-0", 10_000));
        // a last position past the end is clipped; a suffix longer than the file is the whole file
        assertEquals(new EvidenceFiles.Range(9000, 9999), EvidenceFiles.parseRange("bytes=9000-20000", 10_000));
        assertEquals(new EvidenceFiles.Range(0, 9999), EvidenceFiles.parseRange("bytes=-20000", 10_000));
        // several ranges are not served (one range only), nor unsatisfiable or malformed ones
        assertNull(EvidenceFiles.parseRange("bytes=0-0,-1", 10_000));
        assertNull(EvidenceFiles.parseRange("bytes=10000-", 10_000));
        assertNull(EvidenceFiles.parseRange("bytes=500-400", 10_000));
        assertNull(EvidenceFiles.parseRange("bytes=-0", 10_000));
        assertNull(EvidenceFiles.parseRange("bytes=a-b", 10_000));
        assertNull(EvidenceFiles.parseRange("bytes=5", 10_000));
        assertNull(EvidenceFiles.parseRange("items=0-1", 10_000));
        assertNull(EvidenceFiles.parseRange("bytes=0-1", 0));
    }
}

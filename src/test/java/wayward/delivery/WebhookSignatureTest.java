package wayward.delivery;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import org.junit.jupiter.api.Test;

/** HMAC-SHA256 against the test vectors of RFC 4231, section 4 (cases 1–4, 6 and 7; case 5 is truncated). */
class WebhookSignatureTest {
    private static byte[] repeat(int value, int count) {
        byte[] b = new byte[count];
        Arrays.fill(b, (byte) value);
        return b;
    }

    private static byte[] ascii(String s) {
        return s.getBytes(StandardCharsets.US_ASCII);
    }

    @Test
    void matchesRfc4231TestVectors() {
        // RFC 4231 4.2, test case 1
        assertEquals("b0344c61d8db38535ca8afceaf0bf12b881dc200c9833da726e9376c2e32cff7",
                WebhookSignature.hmacSha256Hex(repeat(0x0b, 20), ascii("Hi There")));
        // 4.3, test case 2: a key shorter than the length of the hash
        assertEquals("5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843",
                WebhookSignature.hmacSha256Hex(ascii("Jefe"), ascii("what do ya want for nothing?")));
        // 4.4, test case 3
        assertEquals("773ea91e36800e46854db8ebd09181a72959098b3ef8c122d9635514ced565fe",
                WebhookSignature.hmacSha256Hex(repeat(0xaa, 20), repeat(0xdd, 50)));
        // 4.5, test case 4
        byte[] key4 = new byte[25];
        for (int i = 0; i < 25; i++) {
            key4[i] = (byte) (i + 1);
        }
        assertEquals("82558a389a443c0ea4cc819899f2083a85f0faa3e578f8077a2e3ff46729665b",
                WebhookSignature.hmacSha256Hex(key4, repeat(0xcd, 50)));
        // 4.7, test case 6: a key larger than the block size
        assertEquals("60e431591ee0b67f0d8a26aacbf5b77f8e0bc6213728c5140546040f0ee37f54",
                WebhookSignature.hmacSha256Hex(repeat(0xaa, 131),
                        ascii("Test Using Larger Than Block-Size Key - Hash Key First")));
        // 4.8, test case 7: key and data larger than the block size
        assertEquals("9b09ffa71b942fcb27635fbcd5b0e944bfdc63644f0713938a7f51535c3a35e2",
                WebhookSignature.hmacSha256Hex(repeat(0xaa, 131), ascii("This is a test using a larger than "
                        + "block-size key and a larger than block-size data. The key needs to be hashed before "
                        + "being used by the HMAC algorithm.")));
    }

    @Test
    void signsTimestampDotBody() {
        WebhookSignature s = new WebhookSignature(ascii("Jefe"));
        // the signed message is "<timestamp>.<body>", as the README documents it for receivers
        byte[] body = ascii("{\"id\":\"e1\"}");
        assertEquals("sha256=" + WebhookSignature.hmacSha256Hex(ascii("Jefe"), ascii("1764672000.{\"id\":\"e1\"}")),
                s.sign(1764672000L, body));
    }
}

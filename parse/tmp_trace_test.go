package parse
import ("testing";"os";"github.com/alecthomas/participle/v2";"github.com/alecthomas/participle/v2/lexer")
func TestTmpTrace(t *testing.T){
	for i, s := range []string{benchSpec, "y = x", "y = w0 x", "y = (1 - B) x", "y = w x + a", "y = w x where w ~ 1", "y = w x + AR(1)", "y = w x every 1 s", "y = w x + 1"} {
	toks, _ := lexSpec(s)
	pl, _ := lexer.Upgrade(&sliceLexer{toks: toks})
	f, _ := os.Create("/tmp/trace"+string(rune('0'+i))+".txt")
	if _, err := specParser.ParseFromLexer(pl, participle.Trace(f)); err != nil { t.Fatal(err) }
	f.Close()
	}
}

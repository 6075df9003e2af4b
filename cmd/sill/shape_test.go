package main

import (
	"go/ast"
	"go/parser"
	"go/token"
	"io/fs"
	"path/filepath"
	"strings"
	"testing"
)

// Bounds on every non-test function of the module (TestFunctionShape).
const (
	maxComplexity    = 30
	maxFunctionLines = 120
)

// TestFunctionShape checks the house rule that no non-test function is too
// tangled or too long to read at once: every function and method declared
// in the module's .go files other than _test.go (testdata and hidden
// folders skipped) has
//   - cyclomatic complexity at most maxComplexity, counted as 1 plus one for
//     each if, for, range, non-default case of a switch, type switch or
//     select, and each && or ||; function literals count towards the
//     function that holds them (the count gocyclo makes);
//   - at most maxFunctionLines lines, counted from the line of the func
//     keyword to the line of the closing brace, both included, blank and
//     comment lines inside the body included (the doc comment above is not).
func TestFunctionShape(t *testing.T) {
	root := filepath.Join("..", "..")
	fset := token.NewFileSet()
	functions := 0
	err := filepath.WalkDir(root, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() {
			if path != root && (d.Name() == "testdata" || strings.HasPrefix(d.Name(), ".")) {
				return filepath.SkipDir
			}
			return nil
		}
		if !strings.HasSuffix(path, ".go") || strings.HasSuffix(path, "_test.go") {
			return nil
		}
		file, err := parser.ParseFile(fset, path, nil, parser.SkipObjectResolution)
		if err != nil {
			return err
		}
		for _, decl := range file.Decls {
			fn, ok := decl.(*ast.FuncDecl)
			if !ok || fn.Body == nil {
				continue
			}
			functions++
			name := funcName(fn)
			if c := complexity(fn.Body); c > maxComplexity {
				t.Errorf("%s: %s has cyclomatic complexity %d, more than %d", fset.Position(fn.Pos()), name, c, maxComplexity)
			}
			if lines := fset.Position(fn.End()).Line - fset.Position(fn.Pos()).Line + 1; lines > maxFunctionLines {
				t.Errorf("%s: %s has %d lines, more than %d", fset.Position(fn.Pos()), name, lines, maxFunctionLines)
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if functions < 500 {
		t.Errorf("found %d functions; the walk probably missed the module", functions)
	}
}

// funcName names a declared function as Go doc does: Name or Type.Name.
func funcName(fn *ast.FuncDecl) string {
	if fn.Recv == nil || len(fn.Recv.List) == 0 {
		return fn.Name.Name
	}
	recv := fn.Recv.List[0].Type
	for {
		switch r := recv.(type) {
		case *ast.StarExpr:
			recv = r.X
			continue
		case *ast.IndexExpr:
			recv = r.X
			continue
		case *ast.IndexListExpr:
			recv = r.X
			continue
		case *ast.Ident:
			return r.Name + "." + fn.Name.Name
		}
		return fn.Name.Name
	}
}

// complexity counts a function body's cyclomatic complexity by the rule in
// TestFunctionShape's doc.
func complexity(body *ast.BlockStmt) int {
	c := 1
	ast.Inspect(body, func(n ast.Node) bool {
		switch n := n.(type) {
		case *ast.IfStmt, *ast.ForStmt, *ast.RangeStmt:
			c++
		case *ast.CaseClause:
			if n.List != nil {
				c++
			}
		case *ast.CommClause:
			if n.Comm != nil {
				c++
			}
		case *ast.BinaryExpr:
			if n.Op == token.LAND || n.Op == token.LOR {
				c++
			}
		}
		return true
	})
	return c
}

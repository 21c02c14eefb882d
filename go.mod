module github.com/propscope/propscope

go 1.24.0

require (
	github.com/go-echarts/go-echarts/v2 v2.6.7
	github.com/janpfeifer/gonb v0.11.1
	github.com/santhosh-tekuri/jsonschema/v6 v6.0.3
	github.com/yuin/goldmark v1.8.7
	gonum.org/v1/gonum v0.17.0
)

require (
	github.com/go-logr/logr v1.4.2 // indirect
	github.com/gofrs/uuid v4.4.0+incompatible // indirect
	github.com/pkg/errors v0.9.1 // indirect
	golang.org/x/exp v0.0.0-20250106191152-7588d65b2ba8 // indirect
	golang.org/x/text v0.23.0 // indirect
	k8s.io/klog/v2 v2.130.1 // indirect
)

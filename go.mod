module github.com/antecedent-lab/antecedent

go 1.26
